CREATE TABLE `idempotency_keys` (
	`user_id` text NOT NULL,
	`key` text NOT NULL,
	`method` text NOT NULL,
	`path` text NOT NULL,
	`fingerprint` text NOT NULL,
	`status` text NOT NULL,
	`response_status` integer,
	`response_body` text,
	`created_at` text NOT NULL,
	PRIMARY KEY(`user_id`, `key`)
);
--> statement-breakpoint
CREATE INDEX `idempotency_keys_created_idx` ON `idempotency_keys` (`created_at`);--> statement-breakpoint
CREATE TABLE `approval_limits` (
	`user_id` text PRIMARY KEY NOT NULL,
	`organisation_id` text NOT NULL,
	`limit_cents` integer NOT NULL,
	`updated_at` text NOT NULL,
	`updated_by` text,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`updated_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `approval_limits_org_idx` ON `approval_limits` (`organisation_id`);--> statement-breakpoint
ALTER TABLE `attachments` ADD `retracted_at` text;--> statement-breakpoint
ALTER TABLE `attachments` ADD `retracted_by` text REFERENCES users(id);--> statement-breakpoint
ALTER TABLE `attachments` ADD `retraction_reason` text;--> statement-breakpoint
ALTER TABLE `claims` ADD `first_approved_by` text REFERENCES users(id);--> statement-breakpoint
ALTER TABLE `claims` ADD `first_approved_at` text;--> statement-breakpoint
ALTER TABLE `claims` ADD `first_approved_cents` integer;