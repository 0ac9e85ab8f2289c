-- The scrap report's tallies are kept by the database in the same transaction as every change,
-- whatever writes it (a move, an undo, an intake, the bulk loader). Two steps:
--   unit_event  → unit: the verdict labour and the latest scrap reason of the unit;
--   unit        → lot_tally / lot_scrap_reason_tally: the unit's share, taken out for the old
--                 row and put in for the new one.
-- The report reads only the tallies; tests/integration/lot-tally.test.ts checks that they equal
-- a recount from the units and their history after random moves, undos and intakes.

-- 1. Fill the new unit columns from the history so far.
UPDATE unit SET
	verdict_labour_minutes = coalesce((
		SELECT sum(CASE WHEN json_type(e.data, '$.labourMinutes') IN ('integer', 'real') AND json_extract(e.data, '$.labourMinutes') > 0 THEN json_extract(e.data, '$.labourMinutes') ELSE 0 END)
		FROM unit_event e WHERE e.unit_id = unit.id AND e.action IN ('inspect', 'accept', 'scrap')
	), 0),
	scrap_reason_code = (
		SELECT coalesce(CASE WHEN json_type(e.data, '$.reasonCode') = 'text' THEN json_extract(e.data, '$.reasonCode') END, '(none)')
		FROM unit_event e WHERE e.unit_id = unit.id AND e.action = 'scrap' ORDER BY e.id DESC LIMIT 1
	);
--> statement-breakpoint
INSERT INTO lot_tally (lot_id, model_id, received, waiting, scrapped, scrap_labour_minutes)
SELECT lot_id, model_id, count(*),
	sum(state IN ('received', 'inspected')),
	sum(state = 'scrapped'),
	sum(CASE WHEN state = 'scrapped' THEN verdict_labour_minutes ELSE 0 END)
FROM unit GROUP BY lot_id, model_id;
--> statement-breakpoint
INSERT INTO lot_scrap_reason_tally (lot_id, model_id, reason_code, units)
SELECT lot_id, model_id, scrap_reason_code, count(*)
FROM unit WHERE state = 'scrapped' AND scrap_reason_code IS NOT NULL GROUP BY lot_id, model_id, scrap_reason_code;
--> statement-breakpoint

-- 2. History → unit.
CREATE TRIGGER unit_event_verdict_labour AFTER INSERT ON unit_event
WHEN NEW.action IN ('inspect', 'accept', 'scrap')
	AND json_type(NEW.data, '$.labourMinutes') IN ('integer', 'real') AND json_extract(NEW.data, '$.labourMinutes') > 0
BEGIN
	UPDATE unit SET verdict_labour_minutes = verdict_labour_minutes + json_extract(NEW.data, '$.labourMinutes') WHERE id = NEW.unit_id;
END;
--> statement-breakpoint
CREATE TRIGGER unit_event_scrap_reason AFTER INSERT ON unit_event
WHEN NEW.action = 'scrap'
BEGIN
	UPDATE unit SET scrap_reason_code = coalesce(CASE WHEN json_type(NEW.data, '$.reasonCode') = 'text' THEN json_extract(NEW.data, '$.reasonCode') END, '(none)')
	WHERE id = NEW.unit_id;
END;
--> statement-breakpoint

-- 3. Unit → tallies.
CREATE TRIGGER unit_tally_insert AFTER INSERT ON unit
BEGIN
	INSERT INTO lot_tally (lot_id, model_id, received, waiting, scrapped, scrap_labour_minutes)
	VALUES (NEW.lot_id, NEW.model_id, 1, NEW.state IN ('received', 'inspected'), NEW.state = 'scrapped',
		CASE WHEN NEW.state = 'scrapped' THEN NEW.verdict_labour_minutes ELSE 0 END)
	ON CONFLICT (lot_id, model_id) DO UPDATE SET
		received = received + excluded.received,
		waiting = waiting + excluded.waiting,
		scrapped = scrapped + excluded.scrapped,
		scrap_labour_minutes = scrap_labour_minutes + excluded.scrap_labour_minutes;
	INSERT INTO lot_scrap_reason_tally (lot_id, model_id, reason_code, units)
	SELECT NEW.lot_id, NEW.model_id, NEW.scrap_reason_code, 1
	WHERE NEW.state = 'scrapped' AND NEW.scrap_reason_code IS NOT NULL
	ON CONFLICT (lot_id, model_id, reason_code) DO UPDATE SET units = units + 1;
END;
--> statement-breakpoint
CREATE TRIGGER unit_tally_update AFTER UPDATE ON unit
WHEN OLD.state IS NOT NEW.state OR OLD.lot_id IS NOT NEW.lot_id OR OLD.model_id IS NOT NEW.model_id
	OR OLD.verdict_labour_minutes IS NOT NEW.verdict_labour_minutes OR OLD.scrap_reason_code IS NOT NEW.scrap_reason_code
BEGIN
	UPDATE lot_tally SET
		received = received - 1,
		waiting = waiting - (OLD.state IN ('received', 'inspected')),
		scrapped = scrapped - (OLD.state = 'scrapped'),
		scrap_labour_minutes = scrap_labour_minutes - CASE WHEN OLD.state = 'scrapped' THEN OLD.verdict_labour_minutes ELSE 0 END
	WHERE lot_id = OLD.lot_id AND model_id = OLD.model_id;
	UPDATE lot_scrap_reason_tally SET units = units - 1
	WHERE OLD.state = 'scrapped' AND lot_id = OLD.lot_id AND model_id = OLD.model_id AND reason_code = OLD.scrap_reason_code;
	INSERT INTO lot_tally (lot_id, model_id, received, waiting, scrapped, scrap_labour_minutes)
	VALUES (NEW.lot_id, NEW.model_id, 1, NEW.state IN ('received', 'inspected'), NEW.state = 'scrapped',
		CASE WHEN NEW.state = 'scrapped' THEN NEW.verdict_labour_minutes ELSE 0 END)
	ON CONFLICT (lot_id, model_id) DO UPDATE SET
		received = received + excluded.received,
		waiting = waiting + excluded.waiting,
		scrapped = scrapped + excluded.scrapped,
		scrap_labour_minutes = scrap_labour_minutes + excluded.scrap_labour_minutes;
	INSERT INTO lot_scrap_reason_tally (lot_id, model_id, reason_code, units)
	SELECT NEW.lot_id, NEW.model_id, NEW.scrap_reason_code, 1
	WHERE NEW.state = 'scrapped' AND NEW.scrap_reason_code IS NOT NULL
	ON CONFLICT (lot_id, model_id, reason_code) DO UPDATE SET units = units + 1;
END;
--> statement-breakpoint
CREATE TRIGGER unit_tally_delete AFTER DELETE ON unit
BEGIN
	UPDATE lot_tally SET
		received = received - 1,
		waiting = waiting - (OLD.state IN ('received', 'inspected')),
		scrapped = scrapped - (OLD.state = 'scrapped'),
		scrap_labour_minutes = scrap_labour_minutes - CASE WHEN OLD.state = 'scrapped' THEN OLD.verdict_labour_minutes ELSE 0 END
	WHERE lot_id = OLD.lot_id AND model_id = OLD.model_id;
	UPDATE lot_scrap_reason_tally SET units = units - 1
	WHERE OLD.state = 'scrapped' AND lot_id = OLD.lot_id AND model_id = OLD.model_id AND reason_code = OLD.scrap_reason_code;
END;
