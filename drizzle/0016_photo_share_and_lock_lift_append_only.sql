-- Sharing decisions and lifted sign-in locks are records of who did what: never rewritten.
CREATE TRIGGER unit_photo_share_no_update BEFORE UPDATE ON unit_photo_share
BEGIN
	SELECT RAISE(ABORT, 'unit_photo_share is append-only');
END;
--> statement-breakpoint
CREATE TRIGGER unit_photo_share_no_delete BEFORE DELETE ON unit_photo_share
BEGIN
	SELECT RAISE(ABORT, 'unit_photo_share is append-only');
END;
--> statement-breakpoint
CREATE TRIGGER unit_photo_share_no_replace BEFORE INSERT ON unit_photo_share
WHEN EXISTS (SELECT 1 FROM unit_photo_share WHERE id = NEW.id)
BEGIN
	SELECT RAISE(ABORT, 'unit_photo_share is append-only');
END;
--> statement-breakpoint
CREATE TRIGGER sign_in_lock_lift_no_update BEFORE UPDATE ON sign_in_lock_lift
BEGIN
	SELECT RAISE(ABORT, 'sign_in_lock_lift is append-only');
END;
--> statement-breakpoint
CREATE TRIGGER sign_in_lock_lift_no_delete BEFORE DELETE ON sign_in_lock_lift
BEGIN
	SELECT RAISE(ABORT, 'sign_in_lock_lift is append-only');
END;
--> statement-breakpoint
CREATE TRIGGER sign_in_lock_lift_no_replace BEFORE INSERT ON sign_in_lock_lift
WHEN EXISTS (SELECT 1 FROM sign_in_lock_lift WHERE id = NEW.id)
BEGIN
	SELECT RAISE(ABORT, 'sign_in_lock_lift is append-only');
END;
