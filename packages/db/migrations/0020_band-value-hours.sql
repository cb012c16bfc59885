CREATE TABLE `band_value_hours` (
	`point_id` int NOT NULL,
	`band_key` varchar(64) NOT NULL,
	`hour_at` datetime NOT NULL,
	`n` int NOT NULL,
	`sum_value` double NOT NULL,
	`min_value` double NOT NULL,
	`min_at` datetime(3) NOT NULL,
	`min_analysis_id` bigint unsigned NOT NULL,
	`min_quality` enum('ok','suspect','unusable') NOT NULL,
	`max_value` double NOT NULL,
	`max_at` datetime(3) NOT NULL,
	`max_analysis_id` bigint unsigned NOT NULL,
	`max_quality` enum('ok','suspect','unusable') NOT NULL,
	CONSTRAINT `band_value_hours_point_id_band_key_hour_at_pk` PRIMARY KEY(`point_id`,`band_key`,`hour_at`)
);
--> statement-breakpoint
ALTER TABLE `band_value_hours` ADD CONSTRAINT `band_value_hours_point_id_points_id_fk` FOREIGN KEY (`point_id`) REFERENCES `points`(`id`) ON DELETE cascade ON UPDATE no action;