-- Time partitioning of the three tables a plant-year fills: snapshots, analyses and
-- band_values, by month on `taken_at` (RANGE COLUMNS). InnoDB partitioned tables take no
-- foreign keys (in or out) and every unique key must hold the partition column, so:
-- uids move to `snapshot_uids` (unique per sender), the foreign keys to and from the three
-- tables go (the product keeps those rows in step: point deletion, retention's partition
-- drop), and the primary keys become (id, taken_at) with id still AUTO_INCREMENT.
CREATE TABLE `snapshot_uids` (
	`sender_id` int NOT NULL,
	`uid` varchar(128) NOT NULL,
	`snapshot_id` bigint unsigned NOT NULL,
	CONSTRAINT `snapshot_uids_sender_id_uid_pk` PRIMARY KEY(`sender_id`,`uid`)
);
--> statement-breakpoint
INSERT INTO `snapshot_uids` (`sender_id`, `uid`, `snapshot_id`)
  SELECT `sender_id`, `uid`, `id` FROM `snapshots`;
--> statement-breakpoint
ALTER TABLE `jobs` DROP FOREIGN KEY `jobs_snapshot_id_snapshots_id_fk`;
--> statement-breakpoint
ALTER TABLE `capture_pins` DROP FOREIGN KEY `capture_pins_analysis_id_analyses_id_fk`;
--> statement-breakpoint
ALTER TABLE `quality_notices`
  DROP FOREIGN KEY `quality_notices_analysis_id_analyses_id_fk`,
  DROP FOREIGN KEY `quality_notices_snapshot_id_snapshots_id_fk`;
--> statement-breakpoint
ALTER TABLE `quality_notices`
  RENAME INDEX `quality_notices_analysis_id_analyses_id_fk` TO `quality_notices_analysis_idx`,
  RENAME INDEX `quality_notices_snapshot_id_snapshots_id_fk` TO `quality_notices_snapshot_idx`;
--> statement-breakpoint
ALTER TABLE `band_values`
  DROP FOREIGN KEY `band_values_analysis_id_analyses_id_fk`,
  DROP FOREIGN KEY `band_values_point_id_points_id_fk`;
--> statement-breakpoint
ALTER TABLE `analyses`
  DROP FOREIGN KEY `analyses_snapshot_id_snapshots_id_fk`,
  DROP FOREIGN KEY `analyses_point_id_points_id_fk`;
--> statement-breakpoint
ALTER TABLE `snapshots`
  DROP FOREIGN KEY `snapshots_point_id_points_id_fk`,
  DROP FOREIGN KEY `snapshots_gateway_id_gateways_id_fk`,
  DROP FOREIGN KEY `snapshots_uploaded_by_users_id_fk`;
--> statement-breakpoint
-- Monthly partitions from the first month holding captures (at most 36 months back; older
-- captures share `p_before`) through three months ahead, then `p_future` (MAXVALUE). The
-- worker splits `p_future` into further months ahead (features/worker/partitions.ts).
SET @first_month = LEAST(
  DATE_FORMAT(UTC_TIMESTAMP(), '%Y-%m-01'),
  GREATEST(
    DATE_FORMAT(COALESCE((SELECT MIN(`taken_at`) FROM `snapshots`), UTC_TIMESTAMP()), '%Y-%m-01'),
    DATE_FORMAT(UTC_TIMESTAMP() - INTERVAL 36 MONTH, '%Y-%m-01')));
--> statement-breakpoint
SET @partitions = (
  WITH RECURSIVE `months` (`m`) AS (
    SELECT CAST(@first_month AS DATE)
    UNION ALL
    SELECT `m` + INTERVAL 1 MONTH FROM `months`
     WHERE `m` < CAST(DATE_FORMAT(UTC_TIMESTAMP(), '%Y-%m-01') AS DATE) + INTERVAL 3 MONTH)
  SELECT CONCAT(
    'PARTITION BY RANGE COLUMNS(`taken_at`) (PARTITION `p_before` VALUES LESS THAN (''',
    @first_month, '''), ',
    GROUP_CONCAT(
      CONCAT('PARTITION `p', DATE_FORMAT(`m`, '%Y%m'), '` VALUES LESS THAN (''',
             `m` + INTERVAL 1 MONTH, ''')')
      ORDER BY `m` SEPARATOR ', '),
    ', PARTITION `p_future` VALUES LESS THAN (MAXVALUE))')
  FROM `months`);
--> statement-breakpoint
-- One rebuild per table: the new keys and the partitions in one ALTER.
SET @ddl = CONCAT(
  'ALTER TABLE `snapshots` DROP PRIMARY KEY, ADD PRIMARY KEY (`id`, `taken_at`), ',
  'DROP INDEX `snapshots_sender_uid_uq`, DROP INDEX `snapshots_gateway_id_gateways_id_fk`, ',
  'DROP INDEX `snapshots_uploaded_by_users_id_fk` ', @partitions);
--> statement-breakpoint
PREPARE `partition_table` FROM @ddl;
--> statement-breakpoint
EXECUTE `partition_table`;
--> statement-breakpoint
SET @ddl = CONCAT(
  'ALTER TABLE `analyses` DROP PRIMARY KEY, ADD PRIMARY KEY (`id`, `taken_at`), ',
  'DROP INDEX `analyses_snapshot_uq`, ',
  'ADD CONSTRAINT `analyses_snapshot_uq` UNIQUE (`snapshot_id`, `taken_at`) ', @partitions);
--> statement-breakpoint
PREPARE `partition_table` FROM @ddl;
--> statement-breakpoint
EXECUTE `partition_table`;
--> statement-breakpoint
SET @ddl = CONCAT(
  'ALTER TABLE `band_values` DROP PRIMARY KEY, ADD PRIMARY KEY (`id`, `taken_at`), ',
  'DROP INDEX `band_values_analysis_band_uq`, ',
  'ADD CONSTRAINT `band_values_analysis_band_uq` UNIQUE (`analysis_id`, `band_key`, `taken_at`) ',
  @partitions);
--> statement-breakpoint
PREPARE `partition_table` FROM @ddl;
--> statement-breakpoint
EXECUTE `partition_table`;
--> statement-breakpoint
DEALLOCATE PREPARE `partition_table`;
