DROP INDEX `escalations_flag_id_unique`;--> statement-breakpoint
CREATE UNIQUE INDEX `escalations_flag_severity` ON `escalations` (`flag_id`,`severity`);