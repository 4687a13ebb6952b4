CREATE TRIGGER placement_changes_no_update BEFORE UPDATE ON placement_changes BEGIN SELECT RAISE(ABORT, 'placement changes are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER placement_changes_no_delete BEFORE DELETE ON placement_changes BEGIN SELECT RAISE(ABORT, 'placement changes are append-only'); END;
