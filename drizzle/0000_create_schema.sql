CREATE TABLE `agency_terms` (
	`id` text PRIMARY KEY NOT NULL,
	`agency_id` text NOT NULL,
	`effective_from` text NOT NULL,
	`effective_to` text,
	`labor_rate_cents` integer NOT NULL,
	`travel_rate_cents` integer NOT NULL,
	`mileage_rate_cents` real,
	`max_round_trip_miles` real NOT NULL,
	`max_travel_hours` real NOT NULL,
	`parts_discount_bps` integer DEFAULT 0 NOT NULL,
	`parts_handling_bps` integer DEFAULT 0 NOT NULL,
	`overtime_multiplier` real DEFAULT 1.5 NOT NULL,
	`filing_window_days` integer DEFAULT 30 NOT NULL,
	`created_at` text NOT NULL,
	FOREIGN KEY (`agency_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `agency_terms_agency_idx` ON `agency_terms` (`agency_id`,`effective_from`);--> statement-breakpoint
CREATE TABLE `organisations` (
	`id` text PRIMARY KEY NOT NULL,
	`kind` text NOT NULL,
	`name` text NOT NULL,
	`contact_email` text,
	`address_line` text,
	`city` text,
	`region` text,
	`postal_code` text,
	`country` text DEFAULT 'US' NOT NULL,
	`latitude` real,
	`longitude` real,
	`time_zone` text DEFAULT 'America/Chicago' NOT NULL,
	`currency` text DEFAULT 'USD' NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL
);
--> statement-breakpoint
CREATE INDEX `organisations_kind_idx` ON `organisations` (`kind`);--> statement-breakpoint
CREATE TABLE `certifications` (
	`id` text PRIMARY KEY NOT NULL,
	`organisation_id` text NOT NULL,
	`user_id` text NOT NULL,
	`family_id` text NOT NULL,
	`certificate_number` text NOT NULL,
	`valid_from` text NOT NULL,
	`valid_to` text NOT NULL,
	`attachment_id` text,
	`created_at` text NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`family_id`) REFERENCES `product_families`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `certifications_user_idx` ON `certifications` (`user_id`,`family_id`);--> statement-breakpoint
CREATE INDEX `certifications_org_idx` ON `certifications` (`organisation_id`);--> statement-breakpoint
CREATE TABLE `invitations` (
	`id` text PRIMARY KEY NOT NULL,
	`organisation_id` text NOT NULL,
	`email` text NOT NULL,
	`role` text NOT NULL,
	`token_hash` text NOT NULL,
	`invited_by` text,
	`expires_at` text NOT NULL,
	`accepted_at` text,
	`revoked_at` text,
	`created_at` text NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`invited_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `invitations_token_uq` ON `invitations` (`token_hash`);--> statement-breakpoint
CREATE INDEX `invitations_org_idx` ON `invitations` (`organisation_id`);--> statement-breakpoint
CREATE TABLE `password_resets` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`token_hash` text NOT NULL,
	`expires_at` text NOT NULL,
	`used_at` text,
	`created_at` text NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `password_resets_token_uq` ON `password_resets` (`token_hash`);--> statement-breakpoint
CREATE INDEX `password_resets_user_idx` ON `password_resets` (`user_id`);--> statement-breakpoint
CREATE TABLE `users` (
	`id` text PRIMARY KEY NOT NULL,
	`organisation_id` text NOT NULL,
	`role` text NOT NULL,
	`email` text NOT NULL,
	`name` text NOT NULL,
	`password_hash` text,
	`active` integer DEFAULT true NOT NULL,
	`session_version` integer DEFAULT 1 NOT NULL,
	`last_sign_in_at` text,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `users_email_uq` ON `users` (`email`);--> statement-breakpoint
CREATE INDEX `users_org_idx` ON `users` (`organisation_id`,`role`);--> statement-breakpoint
CREATE TABLE `component_terms` (
	`id` text PRIMARY KEY NOT NULL,
	`model_id` text NOT NULL,
	`part_id` text NOT NULL,
	`label` text NOT NULL,
	`parts_months` integer NOT NULL,
	FOREIGN KEY (`model_id`) REFERENCES `models`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`part_id`) REFERENCES `parts`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `component_terms_uq` ON `component_terms` (`model_id`,`part_id`);--> statement-breakpoint
CREATE TABLE `models` (
	`id` text PRIMARY KEY NOT NULL,
	`family_id` text NOT NULL,
	`model_number` text NOT NULL,
	`name` text NOT NULL,
	`parts_months` integer NOT NULL,
	`labor_months` integer NOT NULL,
	`cap_months_from_ship` integer NOT NULL,
	`install_grace_days` integer DEFAULT 90 NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL,
	FOREIGN KEY (`family_id`) REFERENCES `product_families`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `models_number_uq` ON `models` (`model_number`);--> statement-breakpoint
CREATE INDEX `models_family_idx` ON `models` (`family_id`);--> statement-breakpoint
CREATE TABLE `parts` (
	`id` text PRIMARY KEY NOT NULL,
	`part_number` text NOT NULL,
	`description` text NOT NULL,
	`family_id` text,
	`list_price_cents` integer NOT NULL,
	`return_required` integer DEFAULT false NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL,
	FOREIGN KEY (`family_id`) REFERENCES `product_families`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `parts_number_uq` ON `parts` (`part_number`);--> statement-breakpoint
CREATE INDEX `parts_family_idx` ON `parts` (`family_id`);--> statement-breakpoint
CREATE TABLE `product_families` (
	`id` text PRIMARY KEY NOT NULL,
	`code` text NOT NULL,
	`name` text NOT NULL,
	`fuel` text NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	`created_at` text NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `product_families_code_uq` ON `product_families` (`code`);--> statement-breakpoint
CREATE TABLE `reading_specs` (
	`id` text PRIMARY KEY NOT NULL,
	`model_id` text NOT NULL,
	`key` text NOT NULL,
	`label` text NOT NULL,
	`unit` text NOT NULL,
	`nominal` real NOT NULL,
	`tolerance` real NOT NULL,
	`phase` text NOT NULL,
	`required_for_codes` text NOT NULL,
	FOREIGN KEY (`model_id`) REFERENCES `models`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `reading_specs_uq` ON `reading_specs` (`model_id`,`key`);--> statement-breakpoint
CREATE TABLE `repair_codes` (
	`id` text PRIMARY KEY NOT NULL,
	`code` text NOT NULL,
	`family_id` text NOT NULL,
	`description` text NOT NULL,
	`allowed_hours` real NOT NULL,
	`required_evidence` text NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL,
	FOREIGN KEY (`family_id`) REFERENCES `product_families`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `repair_codes_code_uq` ON `repair_codes` (`code`);--> statement-breakpoint
CREATE INDEX `repair_codes_family_idx` ON `repair_codes` (`family_id`);--> statement-breakpoint
CREATE TABLE `sites` (
	`id` text PRIMARY KEY NOT NULL,
	`name` text NOT NULL,
	`address_line` text NOT NULL,
	`city` text NOT NULL,
	`region` text NOT NULL,
	`postal_code` text NOT NULL,
	`latitude` real NOT NULL,
	`longitude` real NOT NULL,
	`created_at` text NOT NULL
);
--> statement-breakpoint
CREATE INDEX `sites_name_idx` ON `sites` (`name`);--> statement-breakpoint
CREATE TABLE `units` (
	`id` text PRIMARY KEY NOT NULL,
	`serial` text NOT NULL,
	`model_id` text NOT NULL,
	`revision` text NOT NULL,
	`ship_date` text NOT NULL,
	`install_date` text,
	`site_id` text,
	`created_at` text NOT NULL,
	FOREIGN KEY (`model_id`) REFERENCES `models`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `units_serial_uq` ON `units` (`serial`);--> statement-breakpoint
CREATE INDEX `units_model_idx` ON `units` (`model_id`);--> statement-breakpoint
CREATE INDEX `units_site_idx` ON `units` (`site_id`);--> statement-breakpoint
CREATE TABLE `attachments` (
	`id` text PRIMARY KEY NOT NULL,
	`claim_id` text,
	`organisation_id` text NOT NULL,
	`role` text NOT NULL,
	`original_name` text NOT NULL,
	`storage_key` text NOT NULL,
	`thumbnail_key` text,
	`content_type` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`sha256` text NOT NULL,
	`perceptual_hash` text,
	`width` integer,
	`height` integer,
	`taken_at_raw` text,
	`taken_at_offset` text,
	`taken_at_utc` text,
	`gps_latitude` real,
	`gps_longitude` real,
	`uploaded_by` text NOT NULL,
	`created_at` text NOT NULL,
	FOREIGN KEY (`claim_id`) REFERENCES `claims`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`uploaded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `attachments_claim_idx` ON `attachments` (`claim_id`);--> statement-breakpoint
CREATE INDEX `attachments_sha_idx` ON `attachments` (`sha256`);--> statement-breakpoint
CREATE INDEX `attachments_org_idx` ON `attachments` (`organisation_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `attachments_storage_uq` ON `attachments` (`storage_key`);--> statement-breakpoint
CREATE TABLE `claim_counters` (
	`year` integer PRIMARY KEY NOT NULL,
	`next` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `claim_events` (
	`id` text PRIMARY KEY NOT NULL,
	`claim_id` text NOT NULL,
	`actor_id` text,
	`organisation_id` text,
	`type` text NOT NULL,
	`from_state` text,
	`to_state` text,
	`reason` text,
	`comment` text,
	`at` text NOT NULL,
	FOREIGN KEY (`claim_id`) REFERENCES `claims`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`actor_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `claim_events_claim_idx` ON `claim_events` (`claim_id`,`at`);--> statement-breakpoint
CREATE TABLE `claim_labor_lines` (
	`id` text PRIMARY KEY NOT NULL,
	`claim_id` text NOT NULL,
	`position` integer NOT NULL,
	`repair_code_id` text NOT NULL,
	`hours_worked` real NOT NULL,
	`overtime` integer DEFAULT false NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`approved_hours` real,
	`adjustment_reason` text,
	`approved_amount_cents` integer,
	FOREIGN KEY (`claim_id`) REFERENCES `claims`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`repair_code_id`) REFERENCES `repair_codes`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `claim_labor_lines_claim_idx` ON `claim_labor_lines` (`claim_id`,`position`);--> statement-breakpoint
CREATE TABLE `claim_part_lines` (
	`id` text PRIMARY KEY NOT NULL,
	`claim_id` text NOT NULL,
	`position` integer NOT NULL,
	`part_id` text NOT NULL,
	`quantity` integer NOT NULL,
	`approved_quantity` integer,
	`approved_amount_cents` integer,
	`adjustment_reason` text,
	`return_status` text DEFAULT 'not_required' NOT NULL,
	`carrier` text,
	`tracking_number` text,
	`shipped_at` text,
	`received_at` text,
	`received_condition` text,
	`waive_reason` text,
	FOREIGN KEY (`claim_id`) REFERENCES `claims`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`part_id`) REFERENCES `parts`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `claim_part_lines_claim_idx` ON `claim_part_lines` (`claim_id`,`position`);--> statement-breakpoint
CREATE INDEX `claim_part_lines_return_idx` ON `claim_part_lines` (`return_status`);--> statement-breakpoint
CREATE TABLE `claim_readings` (
	`id` text PRIMARY KEY NOT NULL,
	`claim_id` text NOT NULL,
	`spec_id` text,
	`key` text NOT NULL,
	`phase` text NOT NULL,
	`value` real NOT NULL,
	`unit` text NOT NULL,
	`created_at` text NOT NULL,
	FOREIGN KEY (`claim_id`) REFERENCES `claims`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`spec_id`) REFERENCES `reading_specs`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `claim_readings_uq` ON `claim_readings` (`claim_id`,`key`,`phase`);--> statement-breakpoint
CREATE TABLE `claim_travel` (
	`id` text PRIMARY KEY NOT NULL,
	`claim_id` text NOT NULL,
	`round_trip_miles` real NOT NULL,
	`travel_hours` real NOT NULL,
	`approved_amount_cents` integer,
	`adjustment_reason` text,
	FOREIGN KEY (`claim_id`) REFERENCES `claims`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `claim_travel_claim_uq` ON `claim_travel` (`claim_id`);--> statement-breakpoint
CREATE TABLE `claims` (
	`id` text PRIMARY KEY NOT NULL,
	`number` text NOT NULL,
	`agency_id` text NOT NULL,
	`technician_id` text NOT NULL,
	`unit_id` text,
	`site_id` text,
	`state` text DEFAULT 'draft' NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`complaint` text DEFAULT '' NOT NULL,
	`cause` text DEFAULT '' NOT NULL,
	`correction` text DEFAULT '' NOT NULL,
	`failure_date` text,
	`repair_date` text,
	`pre_authorization` text,
	`currency` text DEFAULT 'USD' NOT NULL,
	`claimed_total_cents` integer DEFAULT 0 NOT NULL,
	`approved_total_cents` integer,
	`approved_labor_cents` integer,
	`approved_travel_cents` integer,
	`approved_parts_cents` integer,
	`flags` text DEFAULT '[]' NOT NULL,
	`resubmission_count` integer DEFAULT 0 NOT NULL,
	`first_submitted_at` text,
	`submitted_at` text,
	`reviewer_id` text,
	`decided_at` text,
	`decided_by` text,
	`paid_at` text,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL,
	FOREIGN KEY (`agency_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`technician_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`reviewer_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`decided_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `claims_number_uq` ON `claims` (`number`);--> statement-breakpoint
CREATE INDEX `claims_agency_state_idx` ON `claims` (`agency_id`,`state`,`created_at`);--> statement-breakpoint
CREATE INDEX `claims_state_submitted_idx` ON `claims` (`state`,`submitted_at`);--> statement-breakpoint
CREATE INDEX `claims_technician_idx` ON `claims` (`technician_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `claims_unit_idx` ON `claims` (`unit_id`,`repair_date`);--> statement-breakpoint
CREATE INDEX `claims_created_idx` ON `claims` (`created_at`);--> statement-breakpoint
CREATE INDEX `claims_repair_date_idx` ON `claims` (`repair_date`);--> statement-breakpoint
CREATE TABLE `comments` (
	`id` text PRIMARY KEY NOT NULL,
	`claim_id` text NOT NULL,
	`author_id` text NOT NULL,
	`body` text NOT NULL,
	`created_at` text NOT NULL,
	FOREIGN KEY (`claim_id`) REFERENCES `claims`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `comments_claim_idx` ON `comments` (`claim_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `payment_run_items` (
	`id` text PRIMARY KEY NOT NULL,
	`run_id` text NOT NULL,
	`claim_id` text NOT NULL,
	`amount_cents` integer NOT NULL,
	`active` integer,
	FOREIGN KEY (`run_id`) REFERENCES `payment_runs`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`claim_id`) REFERENCES `claims`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `payment_run_items_run_idx` ON `payment_run_items` (`run_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `payment_run_items_active_claim_uq` ON `payment_run_items` (`claim_id`) WHERE active = 1;--> statement-breakpoint
CREATE TABLE `payment_runs` (
	`id` text PRIMARY KEY NOT NULL,
	`number` text NOT NULL,
	`agency_id` text NOT NULL,
	`state` text DEFAULT 'open' NOT NULL,
	`total_cents` integer NOT NULL,
	`currency` text DEFAULT 'USD' NOT NULL,
	`created_by` text NOT NULL,
	`payment_date` text,
	`reference` text,
	`paid_by` text,
	`paid_at` text,
	`voided_at` text,
	`created_at` text NOT NULL,
	FOREIGN KEY (`agency_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`paid_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `payment_runs_number_uq` ON `payment_runs` (`number`);--> statement-breakpoint
CREATE INDEX `payment_runs_agency_idx` ON `payment_runs` (`agency_id`,`state`);--> statement-breakpoint
CREATE TABLE `audit_log` (
	`id` text PRIMARY KEY NOT NULL,
	`at` text NOT NULL,
	`actor_id` text,
	`organisation_id` text,
	`action` text NOT NULL,
	`record_type` text,
	`record_id` text,
	`outcome` text NOT NULL,
	`ip` text,
	`detail` text
);
--> statement-breakpoint
CREATE INDEX `audit_log_at_idx` ON `audit_log` (`at`);--> statement-breakpoint
CREATE INDEX `audit_log_record_idx` ON `audit_log` (`record_type`,`record_id`);--> statement-breakpoint
CREATE TABLE `outbox` (
	`id` text PRIMARY KEY NOT NULL,
	`to` text NOT NULL,
	`subject` text NOT NULL,
	`text` text NOT NULL,
	`html` text,
	`attachments` text,
	`status` text DEFAULT 'pending' NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`next_attempt_at` text NOT NULL,
	`last_error` text,
	`sent_at` text,
	`created_at` text NOT NULL
);
--> statement-breakpoint
CREATE INDEX `outbox_status_idx` ON `outbox` (`status`,`next_attempt_at`);