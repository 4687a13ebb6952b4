CREATE TABLE `flag_events` (
	`id` text PRIMARY KEY NOT NULL,
	`flag_id` text NOT NULL,
	`infant_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`event` text NOT NULL,
	`at` integer NOT NULL,
	`reading_id` text,
	`severity` text,
	`policy_version_id` text,
	`detail` text DEFAULT '{}' NOT NULL,
	`actor_id` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`flag_id`) REFERENCES `flags`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`infant_id`) REFERENCES `infants`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `flag_events_flag` ON `flag_events` (`flag_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `flag_events_infant` ON `flag_events` (`infant_id`,`at`);--> statement-breakpoint
CREATE TABLE `infant_clocks` (
	`infant_id` text PRIMARY KEY NOT NULL,
	`unit_id` text NOT NULL,
	`computed_at` integer NOT NULL,
	`policy_version_id` text,
	`due_soon_minutes` integer NOT NULL,
	`remote_due_at` integer,
	`last_remote_at` integer,
	`manual_since` integer,
	`manual_due_at` integer,
	`manual_output_pct` integer,
	`manual_limit_minutes` integer,
	`open_flags` text DEFAULT '[]' NOT NULL,
	`latest` text DEFAULT '{}' NOT NULL,
	FOREIGN KEY (`infant_id`) REFERENCES `infants`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `unit_policy_versions` (
	`id` text PRIMARY KEY NOT NULL,
	`unit_id` text NOT NULL,
	`effective_from` integer NOT NULL,
	`settings` text NOT NULL,
	`created_by` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `unit_policy_versions_unit` ON `unit_policy_versions` (`unit_id`,`effective_from`);--> statement-breakpoint
ALTER TABLE `escalations` ADD `recipient` text;--> statement-breakpoint
ALTER TABLE `escalations` ADD `channel` text;--> statement-breakpoint
ALTER TABLE `escalations` ADD `severity` text;--> statement-breakpoint
ALTER TABLE `flags` ADD `severity` text;--> statement-breakpoint
ALTER TABLE `flags` ADD `policy_version_id` text;--> statement-breakpoint
ALTER TABLE `units` ADD `escalation_fallback_email` text;