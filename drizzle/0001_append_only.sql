-- Clinical history is append-only: a correction is a new row, never an edit (21 CFR 11.10(e)).
CREATE TRIGGER readings_no_update BEFORE UPDATE ON readings BEGIN SELECT RAISE(ABORT, 'readings are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER readings_no_delete BEFORE DELETE ON readings BEGIN SELECT RAISE(ABORT, 'readings are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER flags_no_update BEFORE UPDATE ON flags BEGIN SELECT RAISE(ABORT, 'flags are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER flags_no_delete BEFORE DELETE ON flags BEGIN SELECT RAISE(ABORT, 'flags are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER flag_resolutions_no_update BEFORE UPDATE ON flag_resolutions BEGIN SELECT RAISE(ABORT, 'flag resolutions are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER flag_resolutions_no_delete BEFORE DELETE ON flag_resolutions BEGIN SELECT RAISE(ABORT, 'flag resolutions are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER actions_no_update BEFORE UPDATE ON actions BEGIN SELECT RAISE(ABORT, 'actions are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER actions_no_delete BEFORE DELETE ON actions BEGIN SELECT RAISE(ABORT, 'actions are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER reviews_no_update BEFORE UPDATE ON reviews BEGIN SELECT RAISE(ABORT, 'reviews are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER reviews_no_delete BEFORE DELETE ON reviews BEGIN SELECT RAISE(ABORT, 'reviews are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER audit_events_no_update BEFORE UPDATE ON audit_events BEGIN SELECT RAISE(ABORT, 'audit events are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER audit_events_no_delete BEFORE DELETE ON audit_events BEGIN SELECT RAISE(ABORT, 'audit events are append-only'); END;
