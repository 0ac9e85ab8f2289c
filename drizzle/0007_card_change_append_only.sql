-- A card's change log is append-only: who changed what, when, is never rewritten.
CREATE TRIGGER priority_card_change_no_update BEFORE UPDATE ON priority_card_change
BEGIN
	SELECT RAISE(ABORT, 'priority_card_change is append-only');
END;
--> statement-breakpoint
CREATE TRIGGER priority_card_change_no_delete BEFORE DELETE ON priority_card_change
BEGIN
	SELECT RAISE(ABORT, 'priority_card_change is append-only');
END;
