ALTER TABLE `findings` ADD `priority` enum('low','medium','high') DEFAULT 'medium' NOT NULL;--> statement-breakpoint
ALTER TABLE `findings` ADD `owner` varchar(100);--> statement-breakpoint
ALTER TABLE `findings` ADD `planned_downtime_hours` double;