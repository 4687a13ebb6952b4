-- A flag's lifecycle and the unit's settings versions are history: never edited, never deleted.
CREATE TRIGGER flag_events_no_update BEFORE UPDATE ON flag_events BEGIN SELECT RAISE(ABORT, 'flag events are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER flag_events_no_delete BEFORE DELETE ON flag_events BEGIN SELECT RAISE(ABORT, 'flag events are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER unit_policy_versions_no_update BEFORE UPDATE ON unit_policy_versions BEGIN SELECT RAISE(ABORT, 'unit policy versions are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER unit_policy_versions_no_delete BEFORE DELETE ON unit_policy_versions BEGIN SELECT RAISE(ABORT, 'unit policy versions are append-only'); END;
