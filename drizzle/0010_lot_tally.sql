CREATE TABLE `lot_scrap_reason_tally` (
	`lot_id` integer NOT NULL,
	`model_id` integer NOT NULL,
	`reason_code` text NOT NULL,
	`units` integer DEFAULT 0 NOT NULL,
	PRIMARY KEY(`lot_id`, `model_id`, `reason_code`),
	FOREIGN KEY (`lot_id`) REFERENCES `core_lot`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`model_id`) REFERENCES `turbo_model`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `lot_tally` (
	`lot_id` integer NOT NULL,
	`model_id` integer NOT NULL,
	`received` integer DEFAULT 0 NOT NULL,
	`waiting` integer DEFAULT 0 NOT NULL,
	`scrapped` integer DEFAULT 0 NOT NULL,
	`scrap_labour_minutes` real DEFAULT 0 NOT NULL,
	PRIMARY KEY(`lot_id`, `model_id`),
	FOREIGN KEY (`lot_id`) REFERENCES `core_lot`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`model_id`) REFERENCES `turbo_model`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
ALTER TABLE `unit` ADD `verdict_labour_minutes` real DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `unit` ADD `scrap_reason_code` text;