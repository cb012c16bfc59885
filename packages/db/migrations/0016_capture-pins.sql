CREATE TABLE `capture_pins` (
	`analysis_id` bigint unsigned NOT NULL,
	`pinned_by` int NOT NULL,
	`pinned_at` datetime(3) NOT NULL,
	`note` varchar(200) NOT NULL DEFAULT '',
	CONSTRAINT `capture_pins_analysis_id` PRIMARY KEY(`analysis_id`)
);
--> statement-breakpoint
ALTER TABLE `capture_pins` ADD CONSTRAINT `capture_pins_analysis_id_analyses_id_fk` FOREIGN KEY (`analysis_id`) REFERENCES `analyses`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `capture_pins` ADD CONSTRAINT `capture_pins_pinned_by_users_id_fk` FOREIGN KEY (`pinned_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;