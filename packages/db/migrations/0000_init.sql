CREATE TABLE `alert_events` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`alert_id` int NOT NULL,
	`kind` enum('raised','escalated','acknowledged','cleared') NOT NULL,
	`level` enum('alert','danger') NOT NULL,
	`value` double,
	`user_id` int,
	`note` text,
	`at` datetime(3) NOT NULL,
	CONSTRAINT `alert_events_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `alerts` (
	`id` int AUTO_INCREMENT NOT NULL,
	`point_id` int NOT NULL,
	`band_key` varchar(64) NOT NULL,
	`band_name` varchar(200) NOT NULL,
	`level` enum('alert','danger') NOT NULL,
	`state` enum('raised','acknowledged','cleared') NOT NULL,
	`unit` varchar(16) NOT NULL,
	`limit_value` double NOT NULL,
	`first_value` double NOT NULL,
	`last_value` double NOT NULL,
	`peak_value` double NOT NULL,
	`first_at` datetime(3) NOT NULL,
	`last_at` datetime(3) NOT NULL,
	`peak_at` datetime(3) NOT NULL,
	`suspect` boolean NOT NULL DEFAULT false,
	`acknowledged_by` int,
	`acknowledged_at` datetime(3),
	`acknowledge_note` text,
	`cleared_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `alerts_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `analyses` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`snapshot_id` bigint unsigned NOT NULL,
	`point_id` int NOT NULL,
	`taken_at` datetime(3) NOT NULL,
	`accel_rms_g` double NOT NULL,
	`accel_peak_g` double NOT NULL,
	`velocity_rms_mm_s` double NOT NULL,
	`displacement_pkpk_um` double NOT NULL,
	`crest_factor` double NOT NULL,
	`kurtosis` double NOT NULL,
	`speed_rpm` double,
	`speed_source` enum('tach','rpm','estimated','none') NOT NULL,
	`iso_zone` enum('A','B','C','D'),
	`quality_verdict` enum('ok','suspect','unusable') NOT NULL,
	`bits_used` double,
	`quality_findings` json NOT NULL,
	`summary` json NOT NULL,
	`accel_spectrum` mediumblob,
	`velocity_spectrum` mediumblob,
	`envelope_spectrum` mediumblob,
	`order_spectrum` mediumblob,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `analyses_id` PRIMARY KEY(`id`),
	CONSTRAINT `analyses_snapshot_uq` UNIQUE(`snapshot_id`)
);
--> statement-breakpoint
CREATE TABLE `areas` (
	`id` int AUTO_INCREMENT NOT NULL,
	`site_id` int NOT NULL,
	`name` varchar(200) NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `areas_id` PRIMARY KEY(`id`),
	CONSTRAINT `areas_site_name_uq` UNIQUE(`site_id`,`name`)
);
--> statement-breakpoint
CREATE TABLE `audit_log` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`actor_user_id` int,
	`action` varchar(64) NOT NULL,
	`entity` varchar(32) NOT NULL,
	`entity_id` varchar(64) NOT NULL,
	`before` json,
	`after` json,
	`reason` text,
	`at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `audit_log_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `band_values` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`analysis_id` bigint unsigned NOT NULL,
	`point_id` int NOT NULL,
	`band_key` varchar(64) NOT NULL,
	`taken_at` datetime(3) NOT NULL,
	`value` double NOT NULL,
	`quality_verdict` enum('ok','suspect','unusable') NOT NULL,
	CONSTRAINT `band_values_id` PRIMARY KEY(`id`),
	CONSTRAINT `band_values_analysis_band_uq` UNIQUE(`analysis_id`,`band_key`)
);
--> statement-breakpoint
CREATE TABLE `bands` (
	`id` int AUTO_INCREMENT NOT NULL,
	`limit_set_id` int NOT NULL,
	`key` varchar(64) NOT NULL,
	`name` varchar(200) NOT NULL,
	`kind` enum('overall','hz','order','fault') NOT NULL,
	`spectrum` enum('acceleration','velocity','displacement','envelope') NOT NULL,
	`unit` varchar(16) NOT NULL,
	`alert_level` double NOT NULL,
	`danger_level` double NOT NULL,
	`definition` json NOT NULL,
	`sort_order` smallint NOT NULL DEFAULT 0,
	CONSTRAINT `bands_id` PRIMARY KEY(`id`),
	CONSTRAINT `bands_set_key_uq` UNIQUE(`limit_set_id`,`key`)
);
--> statement-breakpoint
CREATE TABLE `bearings` (
	`id` int AUTO_INCREMENT NOT NULL,
	`machine_id` int NOT NULL,
	`name` varchar(100) NOT NULL,
	`designation` varchar(64),
	`rolling_elements` smallint NOT NULL,
	`ball_diameter_mm` double NOT NULL,
	`pitch_diameter_mm` double NOT NULL,
	`contact_angle_deg` double NOT NULL DEFAULT 0,
	`speed_ratio` double NOT NULL DEFAULT 1,
	CONSTRAINT `bearings_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `findings` (
	`id` int AUTO_INCREMENT NOT NULL,
	`point_id` int NOT NULL,
	`alert_id` int,
	`band_key` varchar(64),
	`title` varchar(200) NOT NULL,
	`work_order_ref` varchar(64),
	`due_date` date,
	`state` enum('open','planned','done') NOT NULL DEFAULT 'open',
	`note` text,
	`created_by` int NOT NULL,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `findings_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `gateways` (
	`id` int AUTO_INCREMENT NOT NULL,
	`site_id` int NOT NULL,
	`name` varchar(200) NOT NULL,
	`key_prefix` varchar(16) NOT NULL,
	`key_hash` varchar(64) NOT NULL,
	`revoked_at` datetime(3),
	`last_seen_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `gateways_id` PRIMARY KEY(`id`),
	CONSTRAINT `gateways_key_prefix_uq` UNIQUE(`key_prefix`)
);
--> statement-breakpoint
CREATE TABLE `gears` (
	`id` int AUTO_INCREMENT NOT NULL,
	`machine_id` int NOT NULL,
	`name` varchar(100) NOT NULL,
	`teeth` smallint NOT NULL,
	`mate_teeth` smallint NOT NULL,
	`speed_ratio` double NOT NULL DEFAULT 1,
	CONSTRAINT `gears_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `jobs` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`kind` varchar(32) NOT NULL,
	`snapshot_id` bigint unsigned,
	`payload` json,
	`state` enum('queued','running','done','failed') NOT NULL DEFAULT 'queued',
	`run_after` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`attempts` int NOT NULL DEFAULT 0,
	`max_attempts` int NOT NULL DEFAULT 5,
	`lease_owner` varchar(64),
	`lease_expires_at` datetime(3),
	`last_error` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`finished_at` datetime(3),
	CONSTRAINT `jobs_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `limit_sets` (
	`id` int AUTO_INCREMENT NOT NULL,
	`point_id` int,
	`machine_type` enum('motor','pump','fan','blower','gearbox','compressor'),
	`name` varchar(200) NOT NULL,
	`version` int NOT NULL DEFAULT 1,
	`updated_by` int,
	`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `limit_sets_id` PRIMARY KEY(`id`),
	CONSTRAINT `limit_sets_point_uq` UNIQUE(`point_id`)
);
--> statement-breakpoint
CREATE TABLE `machines` (
	`id` int AUTO_INCREMENT NOT NULL,
	`area_id` int NOT NULL,
	`name` varchar(200) NOT NULL,
	`type` enum('motor','pump','fan','blower','gearbox','compressor') NOT NULL,
	`nominal_rpm` double NOT NULL,
	`iso_group` smallint NOT NULL DEFAULT 2,
	`foundation` enum('rigid','flexible') NOT NULL DEFAULT 'rigid',
	`criticality` enum('low','medium','high') NOT NULL DEFAULT 'medium',
	`power_kw` double,
	`blade_count` smallint,
	`vane_count` smallint,
	`belt` json,
	`notes` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `machines_id` PRIMARY KEY(`id`),
	CONSTRAINT `machines_area_name_uq` UNIQUE(`area_id`,`name`)
);
--> statement-breakpoint
CREATE TABLE `outbox` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`kind` varchar(32) NOT NULL,
	`dedupe_key` varchar(191) NOT NULL,
	`to_address` varchar(254) NOT NULL,
	`subject` varchar(300) NOT NULL,
	`text_body` text NOT NULL,
	`html_body` text,
	`attempts` int NOT NULL DEFAULT 0,
	`next_attempt_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`lease_owner` varchar(64),
	`lease_expires_at` datetime(3),
	`sending_started_at` datetime(3),
	`sent_at` datetime(3),
	`last_error` text,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `outbox_id` PRIMARY KEY(`id`),
	CONSTRAINT `outbox_dedupe_uq` UNIQUE(`dedupe_key`)
);
--> statement-breakpoint
CREATE TABLE `point_states` (
	`point_id` int NOT NULL,
	`state` json NOT NULL,
	`evaluated_taken_at` datetime(3),
	`limit_set_version` int NOT NULL DEFAULT 0,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `point_states_point_id` PRIMARY KEY(`point_id`)
);
--> statement-breakpoint
CREATE TABLE `points` (
	`id` int AUTO_INCREMENT NOT NULL,
	`machine_id` int NOT NULL,
	`tag` varchar(64) NOT NULL,
	`name` varchar(200) NOT NULL,
	`location` varchar(100) NOT NULL,
	`direction` enum('H','V','A') NOT NULL,
	`sensitivity_mv_per_g` double NOT NULL DEFAULT 100,
	`bearing_id` int,
	`fmax_hz` double NOT NULL DEFAULT 1000,
	`lines` int NOT NULL DEFAULT 1600,
	`last_taken_at` datetime(3),
	`last_verdict` enum('ok','suspect','unusable'),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `points_id` PRIMARY KEY(`id`),
	CONSTRAINT `points_tag_uq` UNIQUE(`tag`)
);
--> statement-breakpoint
CREATE TABLE `quality_notices` (
	`id` int AUTO_INCREMENT NOT NULL,
	`point_id` int NOT NULL,
	`analysis_id` bigint unsigned,
	`snapshot_id` bigint unsigned,
	`verdict` enum('ok','suspect','unusable') NOT NULL,
	`findings` json NOT NULL,
	`taken_at` datetime(3) NOT NULL,
	`reviewed_by` int,
	`reviewed_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `quality_notices_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `settings` (
	`key` varchar(64) NOT NULL,
	`value` json NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `settings_key` PRIMARY KEY(`key`)
);
--> statement-breakpoint
CREATE TABLE `sites` (
	`id` int AUTO_INCREMENT NOT NULL,
	`code` varchar(32) NOT NULL,
	`name` varchar(200) NOT NULL,
	`time_zone` varchar(64) NOT NULL DEFAULT 'UTC',
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `sites_id` PRIMARY KEY(`id`),
	CONSTRAINT `sites_code_uq` UNIQUE(`code`)
);
--> statement-breakpoint
CREATE TABLE `snapshots` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`uid` varchar(128) NOT NULL,
	`point_id` int NOT NULL,
	`gateway_id` int,
	`source` enum('gateway','upload') NOT NULL,
	`taken_at` datetime(3) NOT NULL,
	`received_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	`sample_rate_hz` double NOT NULL,
	`sample_count` int NOT NULL,
	`encoding` enum('int16','int24','int32','float32') NOT NULL,
	`adc_bits` smallint NOT NULL,
	`full_scale_v` double NOT NULL,
	`sensitivity_mv_per_g` double NOT NULL,
	`speed_rpm` double,
	`tach` json,
	`samples` mediumblob,
	`samples_expired_at` datetime(3),
	`content_hash` varchar(64) NOT NULL,
	`status` enum('queued','done','rejected','failed') NOT NULL DEFAULT 'queued',
	`status_reason` text,
	`uploaded_by` int,
	`file_name` varchar(255),
	CONSTRAINT `snapshots_id` PRIMARY KEY(`id`),
	CONSTRAINT `snapshots_uid_uq` UNIQUE(`uid`)
);
--> statement-breakpoint
CREATE TABLE `subscriptions` (
	`id` int AUTO_INCREMENT NOT NULL,
	`user_id` int NOT NULL,
	`site_id` int,
	`machine_id` int,
	`min_level` enum('alert','danger') NOT NULL DEFAULT 'alert',
	`cadence` enum('immediate','hourly') NOT NULL DEFAULT 'immediate',
	`weekly_digest` boolean NOT NULL DEFAULT false,
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `subscriptions_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `user_sites` (
	`user_id` int NOT NULL,
	`site_id` int NOT NULL,
	CONSTRAINT `user_sites_user_id_site_id_pk` PRIMARY KEY(`user_id`,`site_id`)
);
--> statement-breakpoint
CREATE TABLE `user_tokens` (
	`id` int AUTO_INCREMENT NOT NULL,
	`user_id` int NOT NULL,
	`purpose` enum('invite','reset') NOT NULL,
	`token_hash` varchar(64) NOT NULL,
	`expires_at` datetime(3) NOT NULL,
	`used_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `user_tokens_id` PRIMARY KEY(`id`),
	CONSTRAINT `user_tokens_hash_uq` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `users` (
	`id` int AUTO_INCREMENT NOT NULL,
	`email` varchar(254) NOT NULL,
	`name` varchar(200) NOT NULL,
	`role` enum('admin','engineer','planner','operator') NOT NULL,
	`password_hash` varchar(100),
	`token_version` int NOT NULL DEFAULT 0,
	`disabled_at` datetime(3),
	`last_sign_in_at` datetime(3),
	`created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `users_id` PRIMARY KEY(`id`),
	CONSTRAINT `users_email_uq` UNIQUE(`email`)
);
--> statement-breakpoint
ALTER TABLE `alert_events` ADD CONSTRAINT `alert_events_alert_id_alerts_id_fk` FOREIGN KEY (`alert_id`) REFERENCES `alerts`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `alert_events` ADD CONSTRAINT `alert_events_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `alerts` ADD CONSTRAINT `alerts_point_id_points_id_fk` FOREIGN KEY (`point_id`) REFERENCES `points`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `alerts` ADD CONSTRAINT `alerts_acknowledged_by_users_id_fk` FOREIGN KEY (`acknowledged_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `analyses` ADD CONSTRAINT `analyses_snapshot_id_snapshots_id_fk` FOREIGN KEY (`snapshot_id`) REFERENCES `snapshots`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `analyses` ADD CONSTRAINT `analyses_point_id_points_id_fk` FOREIGN KEY (`point_id`) REFERENCES `points`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `areas` ADD CONSTRAINT `areas_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `audit_log` ADD CONSTRAINT `audit_log_actor_user_id_users_id_fk` FOREIGN KEY (`actor_user_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `band_values` ADD CONSTRAINT `band_values_analysis_id_analyses_id_fk` FOREIGN KEY (`analysis_id`) REFERENCES `analyses`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `band_values` ADD CONSTRAINT `band_values_point_id_points_id_fk` FOREIGN KEY (`point_id`) REFERENCES `points`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `bands` ADD CONSTRAINT `bands_limit_set_id_limit_sets_id_fk` FOREIGN KEY (`limit_set_id`) REFERENCES `limit_sets`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `bearings` ADD CONSTRAINT `bearings_machine_id_machines_id_fk` FOREIGN KEY (`machine_id`) REFERENCES `machines`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `findings` ADD CONSTRAINT `findings_point_id_points_id_fk` FOREIGN KEY (`point_id`) REFERENCES `points`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `findings` ADD CONSTRAINT `findings_alert_id_alerts_id_fk` FOREIGN KEY (`alert_id`) REFERENCES `alerts`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `findings` ADD CONSTRAINT `findings_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `gateways` ADD CONSTRAINT `gateways_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `gears` ADD CONSTRAINT `gears_machine_id_machines_id_fk` FOREIGN KEY (`machine_id`) REFERENCES `machines`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `jobs` ADD CONSTRAINT `jobs_snapshot_id_snapshots_id_fk` FOREIGN KEY (`snapshot_id`) REFERENCES `snapshots`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `limit_sets` ADD CONSTRAINT `limit_sets_point_id_points_id_fk` FOREIGN KEY (`point_id`) REFERENCES `points`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `limit_sets` ADD CONSTRAINT `limit_sets_updated_by_users_id_fk` FOREIGN KEY (`updated_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `machines` ADD CONSTRAINT `machines_area_id_areas_id_fk` FOREIGN KEY (`area_id`) REFERENCES `areas`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `point_states` ADD CONSTRAINT `point_states_point_id_points_id_fk` FOREIGN KEY (`point_id`) REFERENCES `points`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `points` ADD CONSTRAINT `points_machine_id_machines_id_fk` FOREIGN KEY (`machine_id`) REFERENCES `machines`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `points` ADD CONSTRAINT `points_bearing_id_bearings_id_fk` FOREIGN KEY (`bearing_id`) REFERENCES `bearings`(`id`) ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `quality_notices` ADD CONSTRAINT `quality_notices_point_id_points_id_fk` FOREIGN KEY (`point_id`) REFERENCES `points`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `quality_notices` ADD CONSTRAINT `quality_notices_analysis_id_analyses_id_fk` FOREIGN KEY (`analysis_id`) REFERENCES `analyses`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `quality_notices` ADD CONSTRAINT `quality_notices_snapshot_id_snapshots_id_fk` FOREIGN KEY (`snapshot_id`) REFERENCES `snapshots`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `quality_notices` ADD CONSTRAINT `quality_notices_reviewed_by_users_id_fk` FOREIGN KEY (`reviewed_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `snapshots` ADD CONSTRAINT `snapshots_point_id_points_id_fk` FOREIGN KEY (`point_id`) REFERENCES `points`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `snapshots` ADD CONSTRAINT `snapshots_gateway_id_gateways_id_fk` FOREIGN KEY (`gateway_id`) REFERENCES `gateways`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `snapshots` ADD CONSTRAINT `snapshots_uploaded_by_users_id_fk` FOREIGN KEY (`uploaded_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `subscriptions` ADD CONSTRAINT `subscriptions_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `subscriptions` ADD CONSTRAINT `subscriptions_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `subscriptions` ADD CONSTRAINT `subscriptions_machine_id_machines_id_fk` FOREIGN KEY (`machine_id`) REFERENCES `machines`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `user_sites` ADD CONSTRAINT `user_sites_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `user_sites` ADD CONSTRAINT `user_sites_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `user_tokens` ADD CONSTRAINT `user_tokens_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `alert_events_alert_idx` ON `alert_events` (`alert_id`,`at`);--> statement-breakpoint
CREATE INDEX `alerts_state_idx` ON `alerts` (`state`,`last_at`);--> statement-breakpoint
CREATE INDEX `alerts_point_idx` ON `alerts` (`point_id`,`band_key`,`state`);--> statement-breakpoint
CREATE INDEX `analyses_point_taken_idx` ON `analyses` (`point_id`,`taken_at`);--> statement-breakpoint
CREATE INDEX `audit_entity_idx` ON `audit_log` (`entity`,`entity_id`);--> statement-breakpoint
CREATE INDEX `audit_at_idx` ON `audit_log` (`at`);--> statement-breakpoint
CREATE INDEX `band_values_trend_idx` ON `band_values` (`point_id`,`band_key`,`taken_at`);--> statement-breakpoint
CREATE INDEX `bearings_machine_idx` ON `bearings` (`machine_id`);--> statement-breakpoint
CREATE INDEX `findings_point_idx` ON `findings` (`point_id`);--> statement-breakpoint
CREATE INDEX `findings_state_idx` ON `findings` (`state`,`due_date`);--> statement-breakpoint
CREATE INDEX `gateways_site_idx` ON `gateways` (`site_id`);--> statement-breakpoint
CREATE INDEX `gears_machine_idx` ON `gears` (`machine_id`);--> statement-breakpoint
CREATE INDEX `jobs_claim_idx` ON `jobs` (`state`,`run_after`);--> statement-breakpoint
CREATE INDEX `jobs_lease_idx` ON `jobs` (`state`,`lease_expires_at`);--> statement-breakpoint
CREATE INDEX `jobs_snapshot_idx` ON `jobs` (`snapshot_id`);--> statement-breakpoint
CREATE INDEX `limit_sets_type_idx` ON `limit_sets` (`machine_type`);--> statement-breakpoint
CREATE INDEX `outbox_due_idx` ON `outbox` (`sent_at`,`next_attempt_at`);--> statement-breakpoint
CREATE INDEX `points_machine_idx` ON `points` (`machine_id`);--> statement-breakpoint
CREATE INDEX `quality_notices_point_idx` ON `quality_notices` (`point_id`,`taken_at`);--> statement-breakpoint
CREATE INDEX `quality_notices_open_idx` ON `quality_notices` (`reviewed_at`);--> statement-breakpoint
CREATE INDEX `snapshots_point_taken_idx` ON `snapshots` (`point_id`,`taken_at`);--> statement-breakpoint
CREATE INDEX `snapshots_status_idx` ON `snapshots` (`status`);--> statement-breakpoint
CREATE INDEX `snapshots_received_idx` ON `snapshots` (`received_at`);--> statement-breakpoint
CREATE INDEX `subscriptions_user_idx` ON `subscriptions` (`user_id`);--> statement-breakpoint
CREATE INDEX `subscriptions_site_idx` ON `subscriptions` (`site_id`);--> statement-breakpoint
CREATE INDEX `user_sites_site_idx` ON `user_sites` (`site_id`);