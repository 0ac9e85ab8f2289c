CREATE TABLE `checklist` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`family` text NOT NULL,
	`name` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `checklist_family_unique` ON `checklist` (`family`);--> statement-breakpoint
CREATE TABLE `checklist_item` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`checklist_id` integer NOT NULL,
	`label` text NOT NULL,
	`measure_unit` text,
	`sort_order` integer DEFAULT 0 NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	FOREIGN KEY (`checklist_id`) REFERENCES `checklist`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `checklist_item_list_idx` ON `checklist_item` (`checklist_id`,`sort_order`);--> statement-breakpoint
CREATE TABLE `inspection` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`unit_id` integer NOT NULL,
	`checklist_id` integer,
	`verdict` text NOT NULL,
	`reason_code` text,
	`note` text,
	`user_id` text,
	`station_id` integer,
	`event_seq` integer,
	`at` integer NOT NULL,
	FOREIGN KEY (`unit_id`) REFERENCES `unit`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`checklist_id`) REFERENCES `checklist`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`station_id`) REFERENCES `station`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE INDEX `inspection_unit_idx` ON `inspection` (`unit_id`,`at`);--> statement-breakpoint
CREATE TABLE `inspection_answer` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`inspection_id` integer NOT NULL,
	`item_id` integer,
	`label` text NOT NULL,
	`result` text NOT NULL,
	`measurement` real,
	`measure_unit` text,
	FOREIGN KEY (`inspection_id`) REFERENCES `inspection`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`item_id`) REFERENCES `checklist_item`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `inspection_answer_inspection_idx` ON `inspection_answer` (`inspection_id`);--> statement-breakpoint
CREATE TABLE `unit_photo` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`unit_id` integer NOT NULL,
	`inspection_id` integer,
	`sha256` text NOT NULL,
	`mime` text NOT NULL,
	`bytes` integer NOT NULL,
	`width` integer,
	`height` integer,
	`original_name` text DEFAULT '' NOT NULL,
	`user_id` text,
	`at` integer NOT NULL,
	FOREIGN KEY (`unit_id`) REFERENCES `unit`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`inspection_id`) REFERENCES `inspection`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE INDEX `unit_photo_unit_idx` ON `unit_photo` (`unit_id`);--> statement-breakpoint
CREATE INDEX `unit_photo_sha_idx` ON `unit_photo` (`sha256`);--> statement-breakpoint
CREATE TABLE `user_station` (
	`user_id` text NOT NULL,
	`station_id` integer NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`station_id`) REFERENCES `station`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `user_station_pk` ON `user_station` (`user_id`,`station_id`);--> statement-breakpoint
CREATE INDEX `user_station_station_idx` ON `user_station` (`station_id`);