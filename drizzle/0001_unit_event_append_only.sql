-- A unit's history is append-only: corrections are new events, never edits.
CREATE TRIGGER unit_event_no_update BEFORE UPDATE ON unit_event
BEGIN
	SELECT RAISE(ABORT, 'unit_event is append-only: record a new event instead');
END;
--> statement-breakpoint
CREATE TRIGGER unit_event_no_delete BEFORE DELETE ON unit_event
BEGIN
	SELECT RAISE(ABORT, 'unit_event is append-only: record a new event instead');
END;
