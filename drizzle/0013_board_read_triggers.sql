-- What a station board reads, kept by the database in the same transaction as every change:
-- the station of each unit's latest history entry, and the number of units in each state.

UPDATE unit SET last_station_id = (SELECT e.station_id FROM unit_event e WHERE e.unit_id = unit.id ORDER BY e.seq DESC LIMIT 1);
--> statement-breakpoint
INSERT INTO state_tally (state, units) SELECT state, count(*) FROM unit GROUP BY state;
--> statement-breakpoint
CREATE TRIGGER unit_event_last_station AFTER INSERT ON unit_event
BEGIN
	UPDATE unit SET last_station_id = NEW.station_id WHERE id = NEW.unit_id AND last_station_id IS NOT NEW.station_id;
END;
--> statement-breakpoint
CREATE TRIGGER unit_state_tally_insert AFTER INSERT ON unit
BEGIN
	INSERT INTO state_tally (state, units) VALUES (NEW.state, 1)
	ON CONFLICT (state) DO UPDATE SET units = units + 1;
END;
--> statement-breakpoint
CREATE TRIGGER unit_state_tally_update AFTER UPDATE OF state ON unit
WHEN OLD.state IS NOT NEW.state
BEGIN
	UPDATE state_tally SET units = units - 1 WHERE state = OLD.state;
	INSERT INTO state_tally (state, units) VALUES (NEW.state, 1)
	ON CONFLICT (state) DO UPDATE SET units = units + 1;
END;
--> statement-breakpoint
CREATE TRIGGER unit_state_tally_delete AFTER DELETE ON unit
BEGIN
	UPDATE state_tally SET units = units - 1 WHERE state = OLD.state;
END;
