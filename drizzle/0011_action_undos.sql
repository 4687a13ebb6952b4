CREATE TABLE `action_undos` (
	`id` text PRIMARY KEY NOT NULL,
	`action_id` text NOT NULL,
	`flag_id` text NOT NULL,
	`infant_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`undone_by` text NOT NULL,
	`note` text,
	`at` integer NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`action_id`) REFERENCES `actions`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`flag_id`) REFERENCES `flags`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`infant_id`) REFERENCES `infants`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`undone_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `action_undos_action_id_unique` ON `action_undos` (`action_id`);