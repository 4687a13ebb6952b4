-- Bed stays are history: a move is a new row, never an edit.
CREATE TRIGGER bed_stays_no_update BEFORE UPDATE ON bed_stays BEGIN SELECT RAISE(ABORT, 'bed stays are append-only'); END;
--> statement-breakpoint
CREATE TRIGGER bed_stays_no_delete BEFORE DELETE ON bed_stays BEGIN SELECT RAISE(ABORT, 'bed stays are append-only'); END;
--> statement-breakpoint
-- Infants admitted before this table existed: their stay starts on admission in the bed they are in now
-- (earlier moves were not kept as stays); a discharged infant's bed is not known.
INSERT INTO bed_stays (id, infant_id, unit_id, bed_id, event, at, recorded_by)
  SELECT 'stay-' || id || '-admitted', id, unit_id, bed_id, 'admitted', admitted_at, NULL FROM infants;
--> statement-breakpoint
INSERT INTO bed_stays (id, infant_id, unit_id, bed_id, event, at, recorded_by)
  SELECT 'stay-' || id || '-discharged', id, unit_id, NULL, 'discharged', discharged_at, NULL FROM infants WHERE status = 'discharged' AND discharged_at IS NOT NULL;
