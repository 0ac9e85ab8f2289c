CREATE TABLE `sign_in_lock_lift` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`key` text NOT NULL,
	`locked_until` integer NOT NULL,
	`lifted_by` text NOT NULL,
	`at` integer NOT NULL,
	FOREIGN KEY (`lifted_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE INDEX `sign_in_lock_lift_at_idx` ON `sign_in_lock_lift` (`at`);--> statement-breakpoint
CREATE TABLE `unit_photo_share` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`photo_id` integer NOT NULL,
	`order_id` integer NOT NULL,
	`shared` integer NOT NULL,
	`caption` text DEFAULT '' NOT NULL,
	`user_id` text NOT NULL,
	`at` integer NOT NULL,
	FOREIGN KEY (`photo_id`) REFERENCES `unit_photo`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`order_id`) REFERENCES `rebuild_order`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE restrict
);
--> statement-breakpoint
CREATE INDEX `unit_photo_share_order_idx` ON `unit_photo_share` (`order_id`,`photo_id`,`id`);