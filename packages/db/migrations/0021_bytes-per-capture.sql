-- Thinned analyses keep only what every capture keeps: their summaries lose the detail that
-- served their spectra (axes, peaks, fault frequencies, quality metrics), which the
-- retention pass already removed. New analyses store that detail inside the spectra BLOB.
UPDATE `analyses` SET `summary` = JSON_REMOVE(`summary`, '$.qualityMetrics', '$.spectra', '$.peaks', '$.faultFrequencies') WHERE `spectra_thinned_at` IS NOT NULL AND JSON_CONTAINS_PATH(`summary`, 'one', '$.qualityMetrics', '$.spectra', '$.peaks', '$.faultFrequencies');--> statement-breakpoint
DROP INDEX `band_values_point_time_idx` ON `band_values`;--> statement-breakpoint
-- One rebuild of analyses for its three per-capture JSON columns (MariaDB column compression).
ALTER TABLE `analyses` MODIFY COLUMN `summary` json COMPRESSED NOT NULL, MODIFY COLUMN `diagnosis` json COMPRESSED, MODIFY COLUMN `shaft_vectors` json COMPRESSED;--> statement-breakpoint
ALTER TABLE `snapshots` MODIFY COLUMN `tach` json COMPRESSED;