ALTER TABLE `snapshots` ADD `sender_id` int GENERATED ALWAYS AS (coalesce(`gateway_id`, 0)) STORED;--> statement-breakpoint
ALTER TABLE `snapshots` ADD CONSTRAINT `snapshots_sender_uid_uq` UNIQUE(`sender_id`,`uid`);--> statement-breakpoint
ALTER TABLE `snapshots` DROP INDEX `snapshots_uid_uq`;