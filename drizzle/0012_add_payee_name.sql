ALTER TABLE `payment_runs` ADD `payee_name` text DEFAULT '' NOT NULL;--> statement-breakpoint
UPDATE `payment_runs` SET `payee_name` = (SELECT `name` FROM `organisations` WHERE `organisations`.`id` = `payment_runs`.`agency_id`) WHERE `payee_name` = '';
