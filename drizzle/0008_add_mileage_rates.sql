CREATE TABLE `mileage_rates` (
	`id` text PRIMARY KEY NOT NULL,
	`currency` text NOT NULL,
	`unit` text NOT NULL,
	`effective_from` text NOT NULL,
	`effective_to` text,
	`rate_tenth_cents` integer NOT NULL,
	`source` text NOT NULL,
	`created_by` text,
	`created_at` text NOT NULL,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `mileage_rates_currency_from_uq` ON `mileage_rates` (`currency`,`effective_from`);--> statement-breakpoint
-- IRS business standard mileage rates (cents per mile, in tenths of a cent), each with its notice.
INSERT INTO `mileage_rates` (`id`, `currency`, `unit`, `effective_from`, `effective_to`, `rate_tenth_cents`, `source`, `created_by`, `created_at`) VALUES
  ('mr-usd-2022a', 'USD', 'mi', '2022-01-01', '2022-06-30', 585, 'IRS Notice 2022-03', NULL, '2026-12-02T00:00:00.000Z'),
  ('mr-usd-2022b', 'USD', 'mi', '2022-07-01', '2022-12-31', 625, 'IRS Announcement 2022-13 (news release IR-2022-124)', NULL, '2026-12-02T00:00:00.000Z'),
  ('mr-usd-2023', 'USD', 'mi', '2023-01-01', '2023-12-31', 655, 'IRS Notice 2023-03', NULL, '2026-12-02T00:00:00.000Z'),
  ('mr-usd-2024', 'USD', 'mi', '2024-01-01', '2024-12-31', 670, 'IRS Notice 2024-08', NULL, '2026-12-02T00:00:00.000Z'),
  ('mr-usd-2025', 'USD', 'mi', '2025-01-01', '2025-12-31', 700, 'IRS Notice 2025-5', NULL, '2026-12-02T00:00:00.000Z'),
  ('mr-usd-2026', 'USD', 'mi', '2026-01-01', '2026-12-31', 725, 'IRS Notice 2026-10 (72.5 cents recalled from secondary reports; confirm against the notice)', NULL, '2026-12-02T00:00:00.000Z');
