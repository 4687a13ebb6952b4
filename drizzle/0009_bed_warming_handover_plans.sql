CREATE TABLE `bed_warmings` (
	`id` text PRIMARY KEY NOT NULL,
	`unit_id` text NOT NULL,
	`bed_id` text NOT NULL,
	`event` text NOT NULL,
	`heat_source` text,
	`control_mode` text,
	`set_centi` integer,
	`since` integer,
	`expected_infant` text,
	`end_reason` text,
	`infant_id` text,
	`entered_unit` text,
	`recorded_by` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`bed_id`) REFERENCES `beds`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`infant_id`) REFERENCES `infants`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`recorded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `bed_warmings_bed` ON `bed_warmings` (`bed_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `handover_plans` (
	`id` text PRIMARY KEY NOT NULL,
	`unit_id` text NOT NULL,
	`infant_id` text NOT NULL,
	`shift_date` text NOT NULL,
	`shift` text NOT NULL,
	`plan` text NOT NULL,
	`written_by` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`infant_id`) REFERENCES `infants`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`written_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `handover_plans_infant` ON `handover_plans` (`infant_id`,`shift_date`,`shift`,`created_at`);