ALTER TABLE `points` ADD `envelope_lo_hz` double;--> statement-breakpoint
ALTER TABLE `points` ADD `envelope_hi_hz` double;