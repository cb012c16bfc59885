CREATE TABLE `band_day_sums` (
	`point_id` int NOT NULL,
	`band_key` varchar(64) NOT NULL,
	`day` date NOT NULL,
	`n` int NOT NULL,
	`sum_value` double NOT NULL,
	`sum_taken_ms` double NOT NULL,
	CONSTRAINT `band_day_sums_point_id_day_band_key_pk` PRIMARY KEY(`point_id`,`day`,`band_key`)
);
--> statement-breakpoint
ALTER TABLE `band_day_sums` ADD CONSTRAINT `band_day_sums_point_id_points_id_fk` FOREIGN KEY (`point_id`) REFERENCES `points`(`id`) ON DELETE cascade ON UPDATE no action;