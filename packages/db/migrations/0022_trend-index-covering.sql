-- The trend's projection window reads time, value and quality of one band of a point: the
-- trend index carries value and quality too, so the read never leaves the index (the
-- covering index it used before, band_values_point_time_idx, went in 0021). One statement,
-- so the table is never without its trend index.
ALTER TABLE `band_values` DROP INDEX `band_values_trend_idx`, ADD INDEX `band_values_trend_idx` (`point_id`,`band_key`,`taken_at`,`value`,`quality_verdict`);
