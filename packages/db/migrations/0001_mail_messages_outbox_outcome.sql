CREATE TABLE `mail_messages` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`message_id` varchar(255),
	`mail_from` varchar(320) NOT NULL,
	`mail_to` text NOT NULL,
	`subject` varchar(500) NOT NULL,
	`headers` json NOT NULL,
	`text_body` text,
	`html_body` text,
	`received_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
	CONSTRAINT `mail_messages_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `outbox` ADD `outcome` enum('sent','failed','uncertain');--> statement-breakpoint
CREATE INDEX `mail_messages_message_id_idx` ON `mail_messages` (`message_id`);--> statement-breakpoint
CREATE INDEX `mail_messages_received_idx` ON `mail_messages` (`received_at`);