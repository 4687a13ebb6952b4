CREATE TRIGGER bed_warmings_no_update BEFORE UPDATE ON bed_warmings BEGIN SELECT RAISE(ABORT, 'bed warmings are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER bed_warmings_no_delete BEFORE DELETE ON bed_warmings BEGIN SELECT RAISE(ABORT, 'bed warmings are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER handover_plans_no_update BEFORE UPDATE ON handover_plans BEGIN SELECT RAISE(ABORT, 'handover plans are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER handover_plans_no_delete BEFORE DELETE ON handover_plans BEGIN SELECT RAISE(ABORT, 'handover plans are append-only'); END;
