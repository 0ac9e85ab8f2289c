CREATE TABLE `core_lot` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`code` text NOT NULL,
	`source` text NOT NULL,
	`supplier_id` integer,
	`received_on` text NOT NULL,
	`cost_per_core_cents` integer DEFAULT 0 NOT NULL,
	`expected_count` integer DEFAULT 0 NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`supplier_id`) REFERENCES `supplier`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE UNIQUE INDEX `core_lot_code_unique` ON `core_lot` (`code`);--> statement-breakpoint
CREATE INDEX `core_lot_supplier_idx` ON `core_lot` (`supplier_id`);--> statement-breakpoint
CREATE INDEX `core_lot_received_idx` ON `core_lot` (`received_on`);--> statement-breakpoint
CREATE TABLE `counter` (
	`name` text PRIMARY KEY NOT NULL,
	`value` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `scrap_reason` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`code` text NOT NULL,
	`label` text NOT NULL,
	`category` text NOT NULL,
	`active` integer DEFAULT true NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `scrap_reason_code_unique` ON `scrap_reason` (`code`);--> statement-breakpoint
CREATE TABLE `session` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`expires_at` integer NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `session_user_idx` ON `session` (`user_id`);--> statement-breakpoint
CREATE TABLE `station` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`code` text NOT NULL,
	`name` text NOT NULL,
	`stage` text NOT NULL,
	`material` text,
	`overdue_hours` real DEFAULT 24 NOT NULL,
	`sort_order` integer DEFAULT 0 NOT NULL,
	`active` integer DEFAULT true NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `station_code_unique` ON `station` (`code`);--> statement-breakpoint
CREATE TABLE `supplier` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`active` integer DEFAULT true NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `supplier_name_unique` ON `supplier` (`name`);--> statement-breakpoint
CREATE TABLE `turbo_model` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`code` text NOT NULL,
	`family` text NOT NULL,
	`description` text DEFAULT '' NOT NULL,
	`active` integer DEFAULT true NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `turbo_model_code_unique` ON `turbo_model` (`code`);--> statement-breakpoint
CREATE TABLE `unit` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`serial` text NOT NULL,
	`original_tag` text DEFAULT '' NOT NULL,
	`lot_id` integer NOT NULL,
	`model_id` integer NOT NULL,
	`state` text DEFAULT 'received' NOT NULL,
	`held` integer DEFAULT false NOT NULL,
	`hold_reason` text,
	`priority` integer DEFAULT 0 NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`state_since` integer NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`lot_id`) REFERENCES `core_lot`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`model_id`) REFERENCES `turbo_model`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE UNIQUE INDEX `unit_serial_unique` ON `unit` (`serial`);--> statement-breakpoint
CREATE INDEX `unit_board_idx` ON `unit` (`state`,`held`,`priority`,`state_since`);--> statement-breakpoint
CREATE INDEX `unit_lot_idx` ON `unit` (`lot_id`,`state`);--> statement-breakpoint
CREATE INDEX `unit_model_idx` ON `unit` (`model_id`,`state`);--> statement-breakpoint
CREATE INDEX `unit_tag_idx` ON `unit` (`original_tag`);--> statement-breakpoint
CREATE TABLE `unit_event` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`unit_id` integer NOT NULL,
	`seq` integer NOT NULL,
	`from_state` text,
	`to_state` text NOT NULL,
	`action` text NOT NULL,
	`station_id` integer,
	`user_id` text,
	`at` integer NOT NULL,
	`idempotency_key` text NOT NULL,
	`note` text,
	`data` text,
	FOREIGN KEY (`unit_id`) REFERENCES `unit`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`station_id`) REFERENCES `station`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE UNIQUE INDEX `unit_event_idempotency_key_unique` ON `unit_event` (`idempotency_key`);--> statement-breakpoint
CREATE UNIQUE INDEX `unit_event_unit_seq_idx` ON `unit_event` (`unit_id`,`seq`);--> statement-breakpoint
CREATE INDEX `unit_event_station_at_idx` ON `unit_event` (`station_id`,`at`);--> statement-breakpoint
CREATE INDEX `unit_event_at_idx` ON `unit_event` (`at`);--> statement-breakpoint
CREATE INDEX `unit_event_user_at_idx` ON `unit_event` (`user_id`,`at`);--> statement-breakpoint
CREATE TABLE `user` (
	`id` text PRIMARY KEY NOT NULL,
	`email` text NOT NULL,
	`name` text NOT NULL,
	`role` text NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	`password_hash` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `user_email_unique` ON `user` (`email`);