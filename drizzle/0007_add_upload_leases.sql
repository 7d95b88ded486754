CREATE TABLE `upload_leases` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`expires_at` text NOT NULL,
	`created_at` text NOT NULL
);
--> statement-breakpoint
CREATE INDEX `upload_leases_user_idx` ON `upload_leases` (`user_id`,`expires_at`);