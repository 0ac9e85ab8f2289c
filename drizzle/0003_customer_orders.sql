CREATE TABLE `dev_mail` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`mail_from` text NOT NULL,
	`rcpt_to` text NOT NULL,
	`subject` text DEFAULT '' NOT NULL,
	`raw` text NOT NULL,
	`received_at` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `outbox_message` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`kind` text NOT NULL,
	`order_id` integer,
	`to_address` text NOT NULL,
	`subject` text NOT NULL,
	`text_body` text NOT NULL,
	`html_body` text NOT NULL,
	`status` text DEFAULT 'pending' NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`next_attempt_at` integer NOT NULL,
	`lease_owner` text,
	`lease_until` integer,
	`last_error` text,
	`sent_at` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`order_id`) REFERENCES `rebuild_order`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `outbox_due_idx` ON `outbox_message` (`status`,`next_attempt_at`);--> statement-breakpoint
CREATE INDEX `outbox_order_idx` ON `outbox_message` (`order_id`);--> statement-breakpoint
CREATE TABLE `payment_event` (
	`id` text PRIMARY KEY NOT NULL,
	`type` text NOT NULL,
	`quote_id` integer,
	`received_at` integer NOT NULL,
	FOREIGN KEY (`quote_id`) REFERENCES `quote`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE TABLE `quote` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`order_id` integer NOT NULL,
	`status` text DEFAULT 'draft' NOT NULL,
	`tax_rate_bp` integer DEFAULT 0 NOT NULL,
	`core_cents` integer DEFAULT 0 NOT NULL,
	`core_note` text DEFAULT '' NOT NULL,
	`subtotal_cents` integer DEFAULT 0 NOT NULL,
	`tax_cents` integer DEFAULT 0 NOT NULL,
	`total_cents` integer DEFAULT 0 NOT NULL,
	`sent_at` integer,
	`decided_at` integer,
	`checkout_session_id` text,
	`paid_at` integer,
	`paid_cents` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`order_id`) REFERENCES `rebuild_order`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `quote_order_idx` ON `quote` (`order_id`);--> statement-breakpoint
CREATE TABLE `quote_line` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`quote_id` integer NOT NULL,
	`kind` text NOT NULL,
	`description` text NOT NULL,
	`quantity_hundredths` integer NOT NULL,
	`unit_price_cents` integer NOT NULL,
	`sort_order` integer DEFAULT 0 NOT NULL,
	FOREIGN KEY (`quote_id`) REFERENCES `quote`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `quote_line_quote_idx` ON `quote_line` (`quote_id`);--> statement-breakpoint
CREATE TABLE `rebuild_order` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`code` text NOT NULL,
	`customer_name` text NOT NULL,
	`email` text NOT NULL,
	`phone` text DEFAULT '' NOT NULL,
	`ship_address` text NOT NULL,
	`complaint` text NOT NULL,
	`promised_on` text,
	`unit_id` integer NOT NULL,
	`notify_received` integer DEFAULT true NOT NULL,
	`notify_quote` integer DEFAULT true NOT NULL,
	`notify_in_work` integer DEFAULT true NOT NULL,
	`notify_shipped` integer DEFAULT true NOT NULL,
	`decline_choice` text,
	`created_by` text,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`unit_id`) REFERENCES `unit`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE UNIQUE INDEX `rebuild_order_code_unique` ON `rebuild_order` (`code`);--> statement-breakpoint
CREATE UNIQUE INDEX `rebuild_order_unit_id_unique` ON `rebuild_order` (`unit_id`);--> statement-breakpoint
CREATE INDEX `rebuild_order_email_idx` ON `rebuild_order` (`email`);--> statement-breakpoint
CREATE TABLE `rebuild_setting` (
	`key` text PRIMARY KEY NOT NULL,
	`value` text NOT NULL
);
--> statement-breakpoint
CREATE TABLE `ship_location` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`address` text DEFAULT '' NOT NULL,
	`active` integer DEFAULT true NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `ship_location_name_unique` ON `ship_location` (`name`);--> statement-breakpoint
CREATE TABLE `shipment` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`code` text NOT NULL,
	`destination` text NOT NULL,
	`location_id` integer,
	`order_id` integer,
	`reference` text DEFAULT '' NOT NULL,
	`ship_to` text NOT NULL,
	`carrier` text NOT NULL,
	`tracking_number` text NOT NULL,
	`created_by` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`location_id`) REFERENCES `ship_location`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`order_id`) REFERENCES `rebuild_order`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE UNIQUE INDEX `shipment_code_unique` ON `shipment` (`code`);--> statement-breakpoint
CREATE INDEX `shipment_location_idx` ON `shipment` (`location_id`);--> statement-breakpoint
CREATE TABLE `shipment_unit` (
	`shipment_id` integer NOT NULL,
	`unit_id` integer PRIMARY KEY NOT NULL,
	FOREIGN KEY (`shipment_id`) REFERENCES `shipment`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`unit_id`) REFERENCES `unit`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE TABLE `track_link` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`order_id` integer NOT NULL,
	`token_hash` text NOT NULL,
	`created_at` integer NOT NULL,
	`expires_at` integer NOT NULL,
	`revoked_at` integer,
	FOREIGN KEY (`order_id`) REFERENCES `rebuild_order`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `track_link_token_hash_unique` ON `track_link` (`token_hash`);--> statement-breakpoint
CREATE INDEX `track_link_order_idx` ON `track_link` (`order_id`);