CREATE TABLE `customer_order` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`ref` text NOT NULL,
	`channel` text NOT NULL,
	`customer` text DEFAULT '' NOT NULL,
	`ordered_on` text NOT NULL,
	`due_on` text,
	`status` text DEFAULT 'open' NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`created_by` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE UNIQUE INDEX `customer_order_ref_unique` ON `customer_order` (`ref`);--> statement-breakpoint
CREATE INDEX `customer_order_status_due_idx` ON `customer_order` (`status`,`due_on`);--> statement-breakpoint
CREATE INDEX `customer_order_ordered_idx` ON `customer_order` (`ordered_on`);--> statement-breakpoint
CREATE TABLE `order_line` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`order_id` integer NOT NULL,
	`model_id` integer NOT NULL,
	`quantity` integer NOT NULL,
	FOREIGN KEY (`order_id`) REFERENCES `customer_order`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`model_id`) REFERENCES `turbo_model`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE INDEX `order_line_order_idx` ON `order_line` (`order_id`);--> statement-breakpoint
CREATE INDEX `order_line_model_idx` ON `order_line` (`model_id`);--> statement-breakpoint
CREATE TABLE `plan_setting` (
	`name` text PRIMARY KEY NOT NULL,
	`value` real NOT NULL,
	`updated_by` text,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`updated_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE TABLE `priority_card` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`title` text NOT NULL,
	`due_on` text,
	`rank` integer NOT NULL,
	`style` text DEFAULT 'plain' NOT NULL,
	`kind` text NOT NULL,
	`rule_model_id` integer,
	`rule_stage` text,
	`rule_lot_id` integer,
	`open` integer DEFAULT true NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`created_by` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer NOT NULL,
	`updated_by` text,
	`closed_at` integer,
	FOREIGN KEY (`rule_model_id`) REFERENCES `turbo_model`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`rule_lot_id`) REFERENCES `core_lot`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`updated_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE INDEX `priority_card_open_rank_idx` ON `priority_card` (`open`,`rank`);--> statement-breakpoint
CREATE TABLE `priority_card_change` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`card_id` integer NOT NULL,
	`user_id` text,
	`at` integer NOT NULL,
	`kind` text NOT NULL,
	`detail` text,
	FOREIGN KEY (`card_id`) REFERENCES `priority_card`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE INDEX `priority_card_change_card_idx` ON `priority_card_change` (`card_id`,`at`);--> statement-breakpoint
CREATE TABLE `priority_card_unit` (
	`unit_id` integer PRIMARY KEY NOT NULL,
	`card_id` integer NOT NULL,
	`added_at` integer NOT NULL,
	FOREIGN KEY (`unit_id`) REFERENCES `unit`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`card_id`) REFERENCES `priority_card`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `priority_card_unit_card_idx` ON `priority_card_unit` (`card_id`);