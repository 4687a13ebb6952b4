CREATE TRIGGER action_undos_no_update BEFORE UPDATE ON action_undos BEGIN SELECT RAISE(ABORT, 'action undos are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER action_undos_no_delete BEFORE DELETE ON action_undos BEGIN SELECT RAISE(ABORT, 'action undos are append-only'); END;
