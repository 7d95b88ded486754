CREATE TABLE `part_prices` (
	`id` text PRIMARY KEY NOT NULL,
	`part_id` text NOT NULL,
	`effective_from` text NOT NULL,
	`list_price_cents` integer NOT NULL,
	`created_by` text,
	`created_at` text NOT NULL,
	FOREIGN KEY (`part_id`) REFERENCES `parts`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `part_prices_part_from_uq` ON `part_prices` (`part_id`,`effective_from`);--> statement-breakpoint
CREATE TABLE `repair_code_allowances` (
	`id` text PRIMARY KEY NOT NULL,
	`repair_code_id` text NOT NULL,
	`effective_from` text NOT NULL,
	`allowed_hours` real NOT NULL,
	`created_by` text,
	`created_at` text NOT NULL,
	FOREIGN KEY (`repair_code_id`) REFERENCES `repair_codes`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `repair_code_allowances_code_from_uq` ON `repair_code_allowances` (`repair_code_id`,`effective_from`);