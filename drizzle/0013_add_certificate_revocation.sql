ALTER TABLE `certifications` ADD `revoked_at` text;--> statement-breakpoint
ALTER TABLE `certifications` ADD `revoked_by` text REFERENCES users(id);--> statement-breakpoint
ALTER TABLE `certifications` ADD `revoke_reason` text;