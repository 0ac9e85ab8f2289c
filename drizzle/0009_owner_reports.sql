CREATE TABLE `shop_setting` (
	`key` text PRIMARY KEY NOT NULL,
	`value` text NOT NULL,
	`updated_at` integer NOT NULL
);
--> statement-breakpoint
ALTER TABLE `unit` ADD `return_of_unit_id` integer REFERENCES unit(id);--> statement-breakpoint
CREATE INDEX `unit_lot_model_state_idx` ON `unit` (`lot_id`,`model_id`,`state`);--> statement-breakpoint
CREATE INDEX `unit_event_action_unit_idx` ON `unit_event` (`action`,`unit_id`);