ALTER TABLE `organisations` ADD `name_key` text DEFAULT '' NOT NULL;--> statement-breakpoint
UPDATE `organisations` SET `name_key` = fp_name_key(`name`);--> statement-breakpoint
UPDATE `organisations` SET `name_key` = `name_key` || '#' || `id` WHERE `rowid` NOT IN (SELECT min(`rowid`) FROM `organisations` GROUP BY `name_key`);--> statement-breakpoint
CREATE UNIQUE INDEX `organisations_name_key_uq` ON `organisations` (`name_key`);--> statement-breakpoint
CREATE INDEX `invitations_email_idx` ON `invitations` (`email`);--> statement-breakpoint
CREATE INDEX `units_serial_lower_idx` ON `units` (lower("serial"));
