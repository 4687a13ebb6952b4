CREATE TABLE `infant_placements` (
	`infant_id` text PRIMARY KEY NOT NULL,
	`unit_id` text NOT NULL,
	`probe_site` text,
	`probe_covered` integer,
	`infant_position` text,
	`charted_at` integer NOT NULL,
	`prompt` text,
	`computed_at` integer NOT NULL,
	FOREIGN KEY (`infant_id`) REFERENCES `infants`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `placement_changes` (
	`id` text PRIMARY KEY NOT NULL,
	`infant_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`at` integer NOT NULL,
	`probe_site` text,
	`probe_covered` integer,
	`infant_position` text,
	`recorded_by` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`infant_id`) REFERENCES `infants`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`recorded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `placement_changes_infant` ON `placement_changes` (`infant_id`,`at`);--> statement-breakpoint
ALTER TABLE `actions` ADD `probe_site` text;--> statement-breakpoint
ALTER TABLE `infants` ADD `discharge_reason` text;--> statement-breakpoint
ALTER TABLE `infants` ADD `discharge_destination` text;--> statement-breakpoint
ALTER TABLE `infants` ADD `discharge_note` text;--> statement-breakpoint
ALTER TABLE `readings` ADD `probe_site` text;--> statement-breakpoint
ALTER TABLE `readings` ADD `probe_covered` integer;--> statement-breakpoint
ALTER TABLE `readings` ADD `infant_position` text;--> statement-breakpoint
ALTER TABLE `readings` ADD `weight_grams` integer;--> statement-breakpoint
ALTER TABLE `readings` ADD `humidity_pct` integer;