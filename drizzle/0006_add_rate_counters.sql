CREATE TABLE `audit_repeats` (
	`key` text NOT NULL,
	`minute` integer NOT NULL,
	`count` integer NOT NULL,
	`first_id` text NOT NULL,
	`last_at` text NOT NULL,
	`entry` text NOT NULL,
	PRIMARY KEY(`key`, `minute`)
);
--> statement-breakpoint
CREATE INDEX `audit_repeats_minute_idx` ON `audit_repeats` (`minute`);--> statement-breakpoint
CREATE TABLE `rate_counters` (
	`key` text NOT NULL,
	`window_ms` integer NOT NULL,
	`count` integer NOT NULL,
	`expires_at` integer NOT NULL,
	PRIMARY KEY(`key`, `window_ms`)
);
--> statement-breakpoint
CREATE INDEX `rate_counters_expires_idx` ON `rate_counters` (`expires_at`);