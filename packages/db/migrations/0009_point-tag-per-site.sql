ALTER TABLE `points` ADD `site_id` int;--> statement-breakpoint
-- Every point's site from its machine's area (machine and area are required references, so
-- every point has one); then the column can be required.
UPDATE `points` p JOIN `machines` m ON m.`id` = p.`machine_id` JOIN `areas` a ON a.`id` = m.`area_id` SET p.`site_id` = a.`site_id`;--> statement-breakpoint
ALTER TABLE `points` MODIFY `site_id` int NOT NULL;--> statement-breakpoint
-- Tags unique per site instead of across the installation: the new index first, so tags are
-- never without one.
ALTER TABLE `points` ADD CONSTRAINT `points_site_tag_uq` UNIQUE(`site_id`,`tag`);--> statement-breakpoint
ALTER TABLE `points` DROP INDEX `points_tag_uq`;--> statement-breakpoint
ALTER TABLE `points` ADD CONSTRAINT `points_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE no action ON UPDATE no action;
