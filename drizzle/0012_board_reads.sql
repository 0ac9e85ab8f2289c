CREATE TABLE `state_tally` (
	`state` text PRIMARY KEY NOT NULL,
	`units` integer DEFAULT 0 NOT NULL
);
--> statement-breakpoint
ALTER TABLE `unit` ADD `last_station_id` integer REFERENCES station(id);--> statement-breakpoint
CREATE INDEX `unit_queue_idx` ON `unit` (`state`,`state_since`);--> statement-breakpoint
CREATE INDEX `unit_last_station_idx` ON `unit` (`last_station_id`,`state`);