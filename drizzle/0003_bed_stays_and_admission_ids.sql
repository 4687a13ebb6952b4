CREATE TABLE `bed_stays` (
	`id` text PRIMARY KEY NOT NULL,
	`infant_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`bed_id` text,
	`event` text NOT NULL,
	`at` integer NOT NULL,
	`recorded_by` text,
	FOREIGN KEY (`infant_id`) REFERENCES `infants`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`bed_id`) REFERENCES `beds`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`recorded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `bed_stays_infant_at` ON `bed_stays` (`infant_id`,`at`);--> statement-breakpoint
ALTER TABLE `infants` ADD `hospital_number` text;--> statement-breakpoint
ALTER TABLE `infants` ADD `sex` text;--> statement-breakpoint
ALTER TABLE `readings` ADD `upload_id` text REFERENCES uploads(id);--> statement-breakpoint
ALTER TABLE `readings` ADD `taken_by` text REFERENCES users(id);