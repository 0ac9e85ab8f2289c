CREATE TABLE `sign_in_throttle` (
	`key` text PRIMARY KEY NOT NULL,
	`failures` integer DEFAULT 0 NOT NULL,
	`window_start` integer NOT NULL,
	`locked_until` integer DEFAULT 0 NOT NULL,
	`locks` integer DEFAULT 0 NOT NULL,
	`consecutive` integer DEFAULT 0 NOT NULL
);
