DROP INDEX `unit_last_station_idx`;--> statement-breakpoint
CREATE INDEX `unit_last_station_idx` ON `unit` (`last_station_id`,`state`,`updated_at`);