-- INSERT OR REPLACE deletes the conflicting row without firing DELETE triggers (unless
-- recursive_triggers is on), which would let a history entry be rewritten: refuse any insert
-- that collides with an existing entry, whatever its conflict clause.
CREATE TRIGGER unit_event_no_replace BEFORE INSERT ON unit_event
WHEN EXISTS (
	SELECT 1 FROM unit_event
	WHERE id = NEW.id OR idempotency_key = NEW.idempotency_key OR (unit_id = NEW.unit_id AND seq = NEW.seq)
)
BEGIN
	SELECT RAISE(ABORT, 'unit_event is append-only: record a new event instead');
END;
