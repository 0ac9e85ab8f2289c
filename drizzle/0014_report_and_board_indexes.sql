DROP INDEX `unit_last_station_idx`;--> statement-breakpoint
CREATE INDEX `unit_last_station_idx` ON `unit` (`last_station_id`,`state`,`updated_at`);--> statement-breakpoint
CREATE INDEX `lot_scrap_reason_tally_reason_idx` ON `lot_scrap_reason_tally` (`lot_id`,`reason_code`,`units`);--> statement-breakpoint
CREATE INDEX `lot_tally_model_idx` ON `lot_tally` (`model_id`,`lot_id`,`received`,`waiting`,`scrapped`,`scrap_labour_minutes`);