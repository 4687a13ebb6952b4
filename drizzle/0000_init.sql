CREATE TABLE `actions` (
	`id` text PRIMARY KEY NOT NULL,
	`flag_id` text NOT NULL,
	`infant_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`kind` text NOT NULL,
	`note` text,
	`at` integer NOT NULL,
	`recorded_by` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`flag_id`) REFERENCES `flags`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`infant_id`) REFERENCES `infants`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`recorded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `actions_flag` ON `actions` (`flag_id`);--> statement-breakpoint
CREATE INDEX `actions_infant` ON `actions` (`infant_id`,`at`);--> statement-breakpoint
CREATE TABLE `assignments` (
	`id` text PRIMARY KEY NOT NULL,
	`unit_id` text NOT NULL,
	`infant_id` text NOT NULL,
	`nurse_id` text NOT NULL,
	`shift_date` text NOT NULL,
	`shift` text NOT NULL,
	`created_by` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`infant_id`) REFERENCES `infants`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`nurse_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `assignments_shift` ON `assignments` (`unit_id`,`shift_date`,`shift`);--> statement-breakpoint
CREATE INDEX `assignments_nurse` ON `assignments` (`nurse_id`,`shift_date`);--> statement-breakpoint
CREATE TABLE `audit_events` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`at` integer NOT NULL,
	`actor_id` text,
	`action` text NOT NULL,
	`entity_type` text NOT NULL,
	`entity_id` text,
	`unit_id` text,
	`before` text,
	`after` text,
	`prev_hash` text NOT NULL,
	`hash` text NOT NULL
);
--> statement-breakpoint
CREATE INDEX `audit_entity` ON `audit_events` (`entity_type`,`entity_id`);--> statement-breakpoint
CREATE TABLE `auth_sessions` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`session_version` integer NOT NULL,
	`created_at` integer NOT NULL,
	`last_seen_at` integer NOT NULL,
	`expires_at` integer NOT NULL,
	`revoked_at` integer,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `auth_sessions_user` ON `auth_sessions` (`user_id`);--> statement-breakpoint
CREATE TABLE `beds` (
	`id` text PRIMARY KEY NOT NULL,
	`unit_id` text NOT NULL,
	`label` text NOT NULL,
	`sort_order` integer DEFAULT 0 NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `beds_unit_label` ON `beds` (`unit_id`,`label`);--> statement-breakpoint
CREATE TABLE `caught_mail` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`received_at` integer NOT NULL,
	`from_address` text NOT NULL,
	`to_addresses` text NOT NULL,
	`subject` text NOT NULL,
	`text_body` text NOT NULL,
	`html_body` text
);
--> statement-breakpoint
CREATE TABLE `email_tokens` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`kind` text NOT NULL,
	`token_hash` text NOT NULL,
	`created_at` integer NOT NULL,
	`expires_at` integer NOT NULL,
	`used_at` integer,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `email_tokens_token_hash_unique` ON `email_tokens` (`token_hash`);--> statement-breakpoint
CREATE TABLE `escalations` (
	`id` text PRIMARY KEY NOT NULL,
	`flag_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`escalated_at` integer NOT NULL,
	`mailed_at` integer,
	`acknowledged_at` integer,
	`acknowledged_by` text,
	`acknowledge_note` text,
	FOREIGN KEY (`flag_id`) REFERENCES `flags`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`acknowledged_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `escalations_flag_id_unique` ON `escalations` (`flag_id`);--> statement-breakpoint
CREATE TABLE `flag_resolutions` (
	`flag_id` text PRIMARY KEY NOT NULL,
	`closed_at` integer NOT NULL,
	`closed_by_reading_id` text,
	`how` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`flag_id`) REFERENCES `flags`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `flags` (
	`id` text PRIMARY KEY NOT NULL,
	`infant_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`key` text NOT NULL,
	`kind` text NOT NULL,
	`raised_at` integer NOT NULL,
	`raised_by_reading_id` text,
	`detail` text DEFAULT '{}' NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`infant_id`) REFERENCES `infants`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `flags_infant_key` ON `flags` (`infant_id`,`key`);--> statement-breakpoint
CREATE INDEX `flags_unit_raised` ON `flags` (`unit_id`,`raised_at`);--> statement-breakpoint
CREATE TABLE `infants` (
	`id` text PRIMARY KEY NOT NULL,
	`unit_id` text NOT NULL,
	`bed_id` text,
	`display_name` text NOT NULL,
	`birth_at` integer NOT NULL,
	`gestation_weeks` integer NOT NULL,
	`gestation_days` integer NOT NULL,
	`birth_weight_grams` integer NOT NULL,
	`weight_grams` integer NOT NULL,
	`heat_source` text NOT NULL,
	`status` text DEFAULT 'admitted' NOT NULL,
	`admitted_at` integer NOT NULL,
	`discharged_at` integer,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`bed_id`) REFERENCES `beds`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `infants_unit_status` ON `infants` (`unit_id`,`status`);--> statement-breakpoint
CREATE TABLE `readings` (
	`id` text PRIMARY KEY NOT NULL,
	`infant_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`taken_at` integer NOT NULL,
	`recorded_at` integer NOT NULL,
	`recorded_by` text NOT NULL,
	`probe_centi` integer,
	`remote_centi` integer,
	`remote_site` text,
	`air_centi` integer,
	`set_centi` integer,
	`control_mode` text,
	`heater_output_pct` integer,
	`heart_rate` integer,
	`heat_signs` text DEFAULT '[]' NOT NULL,
	`note` text,
	`entered_unit` text DEFAULT 'C' NOT NULL,
	`late_reason` text,
	`session_id` text,
	`replaces_id` text,
	`correction_reason` text,
	`correction_note` text,
	`entered_in_error` integer DEFAULT false NOT NULL,
	`request_hash` text,
	FOREIGN KEY (`infant_id`) REFERENCES `infants`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`recorded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`session_id`) REFERENCES `skin_to_skin_sessions`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `readings_infant_taken` ON `readings` (`infant_id`,`taken_at`);--> statement-breakpoint
CREATE INDEX `readings_unit_taken` ON `readings` (`unit_id`,`taken_at`);--> statement-breakpoint
CREATE UNIQUE INDEX `readings_replaces` ON `readings` (`replaces_id`);--> statement-breakpoint
CREATE TABLE `reviews` (
	`id` text PRIMARY KEY NOT NULL,
	`flag_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`reviewer_id` text NOT NULL,
	`note` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`flag_id`) REFERENCES `flags`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`reviewer_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `reviews_flag` ON `reviews` (`flag_id`);--> statement-breakpoint
CREATE TABLE `app_settings` (
	`key` text PRIMARY KEY NOT NULL,
	`value` text NOT NULL,
	`updated_at` integer DEFAULT (unixepoch() * 1000) NOT NULL
);
--> statement-breakpoint
CREATE TABLE `sign_in_attempts` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`email` text NOT NULL,
	`address` text NOT NULL,
	`at` integer NOT NULL,
	`succeeded` integer NOT NULL
);
--> statement-breakpoint
CREATE INDEX `sign_in_attempts_email_at` ON `sign_in_attempts` (`email`,`at`);--> statement-breakpoint
CREATE INDEX `sign_in_attempts_address_at` ON `sign_in_attempts` (`address`,`at`);--> statement-breakpoint
CREATE TABLE `skin_to_skin_sessions` (
	`id` text PRIMARY KEY NOT NULL,
	`infant_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`started_at` integer NOT NULL,
	`started_by` text NOT NULL,
	`reference_centi` integer NOT NULL,
	`limit_centi` integer NOT NULL,
	`carer` text,
	`ended_at` integer,
	`ended_by` text,
	FOREIGN KEY (`infant_id`) REFERENCES `infants`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`started_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`ended_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `s2s_infant` ON `skin_to_skin_sessions` (`infant_id`,`started_at`);--> statement-breakpoint
CREATE TABLE `units` (
	`id` text PRIMARY KEY NOT NULL,
	`name` text NOT NULL,
	`hospital_name` text NOT NULL,
	`time_zone` text DEFAULT 'Europe/London' NOT NULL,
	`check_interval_minutes` integer DEFAULT 120 NOT NULL,
	`due_soon_minutes` integer DEFAULT 15 NOT NULL,
	`gap_limit_centi` integer DEFAULT 50 NOT NULL,
	`escalation_delay_minutes` integer DEFAULT 30 NOT NULL,
	`high_output_pct` integer DEFAULT 80 NOT NULL,
	`day_shift_start` text DEFAULT '07:00' NOT NULL,
	`night_shift_start` text DEFAULT '19:00' NOT NULL,
	`created_at` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `uploads` (
	`id` text PRIMARY KEY NOT NULL,
	`kind` text NOT NULL,
	`unit_id` text,
	`filename` text NOT NULL,
	`stored_name` text NOT NULL,
	`sha256` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`row_count` integer DEFAULT 0 NOT NULL,
	`status` text NOT NULL,
	`uploaded_by` text NOT NULL,
	`created_at` integer NOT NULL,
	`imported_at` integer,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`uploaded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `uploads_sha` ON `uploads` (`kind`,`sha256`);--> statement-breakpoint
CREATE TABLE `user_units` (
	`user_id` text NOT NULL,
	`unit_id` text NOT NULL,
	PRIMARY KEY(`user_id`, `unit_id`),
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `users` (
	`id` text PRIMARY KEY NOT NULL,
	`email` text NOT NULL,
	`name` text NOT NULL,
	`role` text NOT NULL,
	`password_hash` text,
	`temp_unit` text DEFAULT 'C' NOT NULL,
	`clock` text DEFAULT '24h' NOT NULL,
	`theme` text DEFAULT 'system' NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	`session_version` integer DEFAULT 1 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `users_email_unique` ON `users` (`email`);