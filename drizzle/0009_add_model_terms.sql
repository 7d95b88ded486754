CREATE TABLE `model_terms` (
	`id` text PRIMARY KEY NOT NULL,
	`model_id` text NOT NULL,
	`effective_from` text NOT NULL,
	`parts_months` integer NOT NULL,
	`labor_months` integer NOT NULL,
	`cap_months_from_ship` integer NOT NULL,
	`install_grace_days` integer NOT NULL,
	`component_terms` text NOT NULL,
	`reason` text,
	`created_by` text,
	`created_at` text NOT NULL,
	FOREIGN KEY (`model_id`) REFERENCES `models`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `model_terms_model_from_uq` ON `model_terms` (`model_id`,`effective_from`);--> statement-breakpoint
DROP INDEX `units_model_idx`;--> statement-breakpoint
ALTER TABLE `units` ADD `registered_on` text;--> statement-breakpoint
CREATE INDEX `units_model_idx` ON `units` (`model_id`,`ship_date`);--> statement-breakpoint
CREATE INDEX `claim_labor_lines_code_idx` ON `claim_labor_lines` (`repair_code_id`);--> statement-breakpoint
CREATE INDEX `claim_part_lines_part_idx` ON `claim_part_lines` (`part_id`);--> statement-breakpoint
-- Backfill: the terms each model has now, in force from the start of its history.
INSERT INTO `model_terms` (`id`, `model_id`, `effective_from`, `parts_months`, `labor_months`, `cap_months_from_ship`, `install_grace_days`, `component_terms`, `reason`, `created_by`, `created_at`)
SELECT 'mt-' || m.`id`, m.`id`, '0001-01-01', m.`parts_months`, m.`labor_months`, m.`cap_months_from_ship`, m.`install_grace_days`,
  COALESCE((SELECT json_group_array(json_object('partId', c.`part_id`, 'label', c.`label`, 'partsMonths', c.`parts_months`)) FROM `component_terms` c WHERE c.`model_id` = m.`id`), '[]'),
  NULL, NULL, m.`created_at`
FROM `models` m;
