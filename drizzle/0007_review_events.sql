CREATE TABLE `review_events` (
	`id` text PRIMARY KEY NOT NULL,
	`flag_id` text NOT NULL,
	`unit_id` text NOT NULL,
	`review_id` text,
	`event` text NOT NULL,
	`note` text,
	`version` integer,
	`actor_id` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`flag_id`) REFERENCES `flags`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`unit_id`) REFERENCES `units`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`review_id`) REFERENCES `reviews`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`actor_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `review_events_flag` ON `review_events` (`flag_id`);--> statement-breakpoint
CREATE INDEX `review_events_review` ON `review_events` (`review_id`);