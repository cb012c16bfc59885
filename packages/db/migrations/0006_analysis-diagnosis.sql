ALTER TABLE `analyses` ADD `diagnosis` json;--> statement-breakpoint
ALTER TABLE `analyses` ADD `shaft_vectors` json;