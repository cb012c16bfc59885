ALTER TABLE `audit_log` ADD `site_id` int;--> statement-breakpoint
CREATE INDEX `audit_site_idx` ON `audit_log` (`site_id`,`id`);--> statement-breakpoint
-- Entries written before the column existed: their site from the entity, where it still exists.
UPDATE `audit_log` a JOIN `sites` s ON a.`entity` = 'site' AND s.`id` = a.`entity_id` SET a.`site_id` = s.`id`;--> statement-breakpoint
UPDATE `audit_log` a JOIN `areas` ar ON a.`entity` = 'area' AND ar.`id` = a.`entity_id` SET a.`site_id` = ar.`site_id`;--> statement-breakpoint
UPDATE `audit_log` a JOIN `gateways` g ON a.`entity` = 'gateway' AND g.`id` = a.`entity_id` SET a.`site_id` = g.`site_id`;--> statement-breakpoint
UPDATE `audit_log` a JOIN `machines` m ON a.`entity` = 'machine' AND m.`id` = a.`entity_id` JOIN `areas` ar ON ar.`id` = m.`area_id` SET a.`site_id` = ar.`site_id`;--> statement-breakpoint
UPDATE `audit_log` a JOIN `points` p ON a.`entity` = 'point' AND p.`id` = a.`entity_id` JOIN `machines` m ON m.`id` = p.`machine_id` JOIN `areas` ar ON ar.`id` = m.`area_id` SET a.`site_id` = ar.`site_id`;--> statement-breakpoint
UPDATE `audit_log` a JOIN `alerts` al ON a.`entity` = 'alert' AND al.`id` = a.`entity_id` JOIN `points` p ON p.`id` = al.`point_id` JOIN `machines` m ON m.`id` = p.`machine_id` JOIN `areas` ar ON ar.`id` = m.`area_id` SET a.`site_id` = ar.`site_id`;--> statement-breakpoint
UPDATE `audit_log` a JOIN `findings` f ON a.`entity` = 'finding' AND f.`id` = a.`entity_id` JOIN `points` p ON p.`id` = f.`point_id` JOIN `machines` m ON m.`id` = p.`machine_id` JOIN `areas` ar ON ar.`id` = m.`area_id` SET a.`site_id` = ar.`site_id`;
