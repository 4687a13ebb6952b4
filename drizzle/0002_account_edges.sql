ALTER TABLE `caught_mail` ADD `sent_by` text;--> statement-breakpoint
ALTER TABLE `sign_in_attempts` ADD `kind` text DEFAULT 'sign-in' NOT NULL;--> statement-breakpoint
ALTER TABLE `sign_in_attempts` ADD `device` text;--> statement-breakpoint
CREATE INDEX `sign_in_attempts_device_at` ON `sign_in_attempts` (`device`,`at`);