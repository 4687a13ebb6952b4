/**
 * Which tables the row ledger binds into the audit hash chain (server/ledger.ts), and which it
 * leaves out and why. `tests/server/tamper-registry.test.ts` fails when a table in db/schema.ts is
 * in neither list, or when a chained table's newest version does not name every column.
 *
 * Registering a table is one line in CHAINED: its key column(s), the column naming its unit (or
 * null), and its columns as of now, as version 1.
 *
 * A migration that adds a column to a chained table appends a version (the old list plus the new
 * column) and never edits an older one: rows written before keep verifying against the version
 * their event names, and rows written from then on are hashed with the new column too. Never drop
 * or rename a chained column (the older versions still read it).
 */
export interface ChainedTable {
  /** The column(s) that identify a row; the audit event's entity id is their values joined by ':'. */
  key: readonly string[];
  /** The column holding the row's unit, copied into the event so unit-scoped audit reads find it. */
  unit: string | null;
  /** Canonical columns per version, oldest first; version n is `versions[n - 1]`. */
  versions: readonly (readonly string[])[];
}

export const CHAINED: Readonly<Record<string, ChainedTable>> = {
  units: {
    key: ['id'],
    unit: 'id',
    versions: [
      [
        'id',
        'name',
        'hospital_name',
        'time_zone',
        'check_interval_minutes',
        'due_soon_minutes',
        'gap_limit_centi',
        'escalation_delay_minutes',
        'high_output_pct',
        'day_shift_start',
        'night_shift_start',
        'created_at',
      ],
      [
        'id',
        'name',
        'hospital_name',
        'time_zone',
        'check_interval_minutes',
        'due_soon_minutes',
        'gap_limit_centi',
        'escalation_delay_minutes',
        'high_output_pct',
        'day_shift_start',
        'night_shift_start',
        'created_at',
        'escalation_fallback_email',
      ],
    ],
  },
  unit_policy_versions: { key: ['id'], unit: 'unit_id', versions: [['id', 'unit_id', 'effective_from', 'settings', 'created_by', 'created_at']] },
  beds: { key: ['id'], unit: 'unit_id', versions: [['id', 'unit_id', 'label', 'sort_order', 'active']] },
  users: {
    key: ['id'],
    unit: null,
    versions: [['id', 'email', 'name', 'role', 'password_hash', 'temp_unit', 'clock', 'theme', 'active', 'session_version', 'created_at', 'updated_at']],
  },
  user_units: { key: ['user_id', 'unit_id'], unit: 'unit_id', versions: [['user_id', 'unit_id']] },
  infants: {
    key: ['id'],
    unit: 'unit_id',
    versions: [
      [
        'id',
        'unit_id',
        'bed_id',
        'display_name',
        'birth_at',
        'gestation_weeks',
        'gestation_days',
        'birth_weight_grams',
        'weight_grams',
        'heat_source',
        'status',
        'admitted_at',
        'discharged_at',
        'hospital_number',
        'sex',
      ],
      [
        'id',
        'unit_id',
        'bed_id',
        'display_name',
        'birth_at',
        'gestation_weeks',
        'gestation_days',
        'birth_weight_grams',
        'weight_grams',
        'heat_source',
        'status',
        'admitted_at',
        'discharged_at',
        'hospital_number',
        'sex',
        'discharge_reason',
        'discharge_destination',
        'discharge_note',
      ],
    ],
  },
  bed_stays: { key: ['id'], unit: 'unit_id', versions: [['id', 'infant_id', 'unit_id', 'bed_id', 'event', 'at', 'recorded_by']] },
  assignments: { key: ['id'], unit: 'unit_id', versions: [['id', 'unit_id', 'infant_id', 'nurse_id', 'shift_date', 'shift', 'created_by', 'created_at']] },
  skin_to_skin_sessions: {
    key: ['id'],
    unit: 'unit_id',
    versions: [['id', 'infant_id', 'unit_id', 'started_at', 'started_by', 'reference_centi', 'limit_centi', 'carer', 'ended_at', 'ended_by']],
  },
  readings: {
    key: ['id'],
    unit: 'unit_id',
    versions: [
      [
        'id',
        'infant_id',
        'unit_id',
        'taken_at',
        'recorded_at',
        'recorded_by',
        'probe_centi',
        'remote_centi',
        'remote_site',
        'air_centi',
        'set_centi',
        'control_mode',
        'heater_output_pct',
        'heart_rate',
        'heat_signs',
        'note',
        'entered_unit',
        'late_reason',
        'session_id',
        'replaces_id',
        'correction_reason',
        'correction_note',
        'entered_in_error',
        'upload_id',
        'taken_by',
        'request_hash',
      ],
      [
        'id',
        'infant_id',
        'unit_id',
        'taken_at',
        'recorded_at',
        'recorded_by',
        'probe_centi',
        'remote_centi',
        'remote_site',
        'air_centi',
        'set_centi',
        'control_mode',
        'heater_output_pct',
        'heart_rate',
        'heat_signs',
        'note',
        'entered_unit',
        'late_reason',
        'session_id',
        'replaces_id',
        'correction_reason',
        'correction_note',
        'entered_in_error',
        'upload_id',
        'taken_by',
        'request_hash',
        'probe_site',
        'probe_covered',
        'infant_position',
        'weight_grams',
        'humidity_pct',
      ],
    ],
  },
  flags: {
    key: ['id'],
    unit: 'unit_id',
    versions: [
      ['id', 'infant_id', 'unit_id', 'key', 'kind', 'raised_at', 'raised_by_reading_id', 'detail', 'created_at'],
      ['id', 'infant_id', 'unit_id', 'key', 'kind', 'raised_at', 'raised_by_reading_id', 'detail', 'created_at', 'severity', 'policy_version_id'],
    ],
  },
  flag_events: {
    key: ['id'],
    unit: 'unit_id',
    versions: [['id', 'flag_id', 'infant_id', 'unit_id', 'event', 'at', 'reading_id', 'severity', 'policy_version_id', 'detail', 'actor_id', 'created_at']],
  },
  flag_resolutions: { key: ['flag_id'], unit: null, versions: [['flag_id', 'closed_at', 'closed_by_reading_id', 'how', 'created_at']] },
  actions: {
    key: ['id'],
    unit: 'unit_id',
    versions: [
      ['id', 'flag_id', 'infant_id', 'unit_id', 'kind', 'note', 'at', 'recorded_by', 'created_at'],
      ['id', 'flag_id', 'infant_id', 'unit_id', 'kind', 'note', 'at', 'recorded_by', 'created_at', 'probe_site'],
    ],
  },
  action_undos: { key: ['id'], unit: 'unit_id', versions: [['id', 'action_id', 'flag_id', 'infant_id', 'unit_id', 'undone_by', 'note', 'at', 'created_at']] },
  escalations: {
    key: ['id'],
    unit: 'unit_id',
    versions: [
      ['id', 'flag_id', 'unit_id', 'escalated_at', 'mailed_at', 'acknowledged_at', 'acknowledged_by', 'acknowledge_note'],
      ['id', 'flag_id', 'unit_id', 'escalated_at', 'mailed_at', 'acknowledged_at', 'acknowledged_by', 'acknowledge_note', 'recipient', 'channel', 'severity'],
    ],
  },
  reviews: { key: ['id'], unit: 'unit_id', versions: [['id', 'flag_id', 'unit_id', 'reviewer_id', 'note', 'created_at']] },
  review_events: { key: ['id'], unit: 'unit_id', versions: [['id', 'flag_id', 'unit_id', 'review_id', 'event', 'note', 'version', 'actor_id', 'created_at']] },
  bed_warmings: {
    key: ['id'],
    unit: 'unit_id',
    versions: [
      [
        'id',
        'unit_id',
        'bed_id',
        'event',
        'heat_source',
        'control_mode',
        'set_centi',
        'since',
        'expected_infant',
        'end_reason',
        'infant_id',
        'entered_unit',
        'recorded_by',
        'created_at',
      ],
    ],
  },
  placement_changes: {
    key: ['id'],
    unit: 'unit_id',
    versions: [['id', 'infant_id', 'unit_id', 'at', 'probe_site', 'probe_covered', 'infant_position', 'recorded_by', 'created_at']],
  },
  handover_plans: { key: ['id'], unit: 'unit_id', versions: [['id', 'unit_id', 'infant_id', 'shift_date', 'shift', 'plan', 'written_by', 'created_at']] },
  uploads: {
    key: ['id'],
    unit: 'unit_id',
    versions: [['id', 'kind', 'unit_id', 'filename', 'stored_name', 'sha256', 'size_bytes', 'row_count', 'status', 'uploaded_by', 'created_at', 'imported_at']],
  },
};

/** Tables deliberately outside the row ledger, each with the reason. */
export const EXEMPT: Readonly<Record<string, string>> = {
  audit_events: 'the hash chain itself; its links and event hashes are what audit:verify walks',
  auth_sessions: 'session bookkeeping touched on every request; sign-in, sign-out and revocation are audit events of their own',
  sign_in_attempts: 'throttling counters, not part of the record; sign-ins are audit events',
  email_tokens: 'hashes of single-use links; issuing and using one are audit events',
  caught_mail: "the demo's mail catcher, a stand-in for an outside mail server",
  infant_clocks: 'derived: what the last evaluation of the chained readings, actions and flags found (next-due instants), rebuilt by every sync',
  infant_placements: 'derived: the current placement and its prompt, rebuilt from the chained readings, placement changes and actions by every write that could change it',
  app_settings: "the scheduler's bookkeeping (the last weekly digest sent), not clinical content",
};
