/**
 * The whole Warmfold schema. Temperatures are integer hundredths of a degree Celsius
 * (`*_centi`); instants are UTC milliseconds since the epoch (`*_at`, integer, mode
 * 'timestamp_ms'). Clinical rows (readings, flags, flag_resolutions, actions, reviews,
 * audit_events) are append-only: triggers in the migrations refuse UPDATE and DELETE.
 */
import { sql } from 'drizzle-orm';
import { index, integer, primaryKey, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';

const instant = (name: string) => integer(name, { mode: 'timestamp_ms' });
const flag = (name: string) => integer(name, { mode: 'boolean' });

export const units = sqliteTable('units', {
  id: text('id').primaryKey(),
  name: text('name').notNull(),
  hospitalName: text('hospital_name').notNull(),
  timeZone: text('time_zone').notNull().default('Europe/London'),
  checkIntervalMinutes: integer('check_interval_minutes').notNull().default(120),
  dueSoonMinutes: integer('due_soon_minutes').notNull().default(15),
  gapLimitCenti: integer('gap_limit_centi').notNull().default(50),
  escalationDelayMinutes: integer('escalation_delay_minutes').notNull().default(30),
  highOutputPct: integer('high_output_pct').notNull().default(80),
  dayShiftStart: text('day_shift_start').notNull().default('07:00'),
  nightShiftStart: text('night_shift_start').notNull().default('19:00'),
  /** Where an escalation goes when no charge nurse is assigned on the shift (set by the administrator). */
  escalationFallbackEmail: text('escalation_fallback_email'),
  createdAt: instant('created_at').notNull(),
});

/**
 * A unit's settings as versions: each version is in force from `effectiveFrom` until the next.
 * Judgements (a check's due time, a report's figures) use the version in force at the time, so a
 * change never rewrites history. `settings` is the whole UnitPolicy as JSON.
 */
export const unitPolicyVersions = sqliteTable(
  'unit_policy_versions',
  {
    id: text('id').primaryKey(),
    unitId: text('unit_id')
      .notNull()
      .references(() => units.id),
    effectiveFrom: instant('effective_from').notNull(),
    settings: text('settings').notNull(),
    createdBy: text('created_by'),
    createdAt: instant('created_at').notNull(),
  },
  (t) => [index('unit_policy_versions_unit').on(t.unitId, t.effectiveFrom)],
);

/** A required reference to the unit a row belongs to: every clinical row carries one. */
const unitRef = () =>
  text('unit_id')
    .notNull()
    .references(() => units.id);

export const beds = sqliteTable(
  'beds',
  {
    id: text('id').primaryKey(),
    unitId: unitRef(),
    label: text('label').notNull(),
    sortOrder: integer('sort_order').notNull().default(0),
    active: flag('active').notNull().default(true),
  },
  (t) => [uniqueIndex('beds_unit_label').on(t.unitId, t.label)],
);

export const users = sqliteTable('users', {
  id: text('id').primaryKey(),
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  role: text('role', { enum: ['nurse', 'charge', 'educator', 'admin'] }).notNull(),
  passwordHash: text('password_hash'),
  tempUnit: text('temp_unit', { enum: ['C', 'F'] })
    .notNull()
    .default('C'),
  clock: text('clock', { enum: ['24h', '12h'] })
    .notNull()
    .default('24h'),
  theme: text('theme', { enum: ['system', 'light', 'dark'] })
    .notNull()
    .default('system'),
  active: flag('active').notNull().default(true),
  /** Bumped by a password change, role or unit change, or deactivation: older tokens stop working. */
  sessionVersion: integer('session_version').notNull().default(1),
  createdAt: instant('created_at').notNull(),
  updatedAt: instant('updated_at').notNull(),
});

/** Which units a user belongs to. Nurses and charge nurses usually have one; educators may have several. */
export const userUnits = sqliteTable(
  'user_units',
  {
    userId: text('user_id')
      .notNull()
      .references(() => users.id),
    unitId: unitRef(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.unitId] })],
);

/** One row per signed-in session; the token's `jti` is the id. */
export const authSessions = sqliteTable(
  'auth_sessions',
  {
    id: text('id').primaryKey(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id),
    sessionVersion: integer('session_version').notNull(),
    createdAt: instant('created_at').notNull(),
    lastSeenAt: instant('last_seen_at').notNull(),
    expiresAt: instant('expires_at').notNull(),
    revokedAt: instant('revoked_at'),
  },
  (t) => [index('auth_sessions_user').on(t.userId)],
);

export const signInAttempts = sqliteTable(
  'sign_in_attempts',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    email: text('email').notNull(),
    address: text('address').notNull(),
    at: instant('at').notNull(),
    succeeded: flag('succeeded').notNull(),
    /** What was tried: a sign-in, the current-password check of a password change, or a reset request. */
    kind: text('kind', { enum: ['sign-in', 'password-check', 'reset-request'] })
      .notNull()
      .default('sign-in'),
    /** The device cookie's id when the browser had signed in to this account before (its own budget). */
    device: text('device'),
  },
  (t) => [index('sign_in_attempts_email_at').on(t.email, t.at), index('sign_in_attempts_address_at').on(t.address, t.at), index('sign_in_attempts_device_at').on(t.device, t.at)],
);

/** Single-use links sent by e-mail: invitations and password resets. Only a hash of the token is kept. */
export const emailTokens = sqliteTable('email_tokens', {
  id: text('id').primaryKey(),
  userId: text('user_id')
    .notNull()
    .references(() => users.id),
  kind: text('kind', { enum: ['invite', 'reset'] }).notNull(),
  tokenHash: text('token_hash').notNull().unique(),
  createdAt: instant('created_at').notNull(),
  expiresAt: instant('expires_at').notNull(),
  usedAt: instant('used_at'),
});

export const infants = sqliteTable(
  'infants',
  {
    id: text('id').primaryKey(),
    unitId: unitRef(),
    bedId: text('bed_id').references(() => beds.id),
    displayName: text('display_name').notNull(),
    birthAt: instant('birth_at').notNull(),
    gestationWeeks: integer('gestation_weeks').notNull(),
    gestationDays: integer('gestation_days').notNull(),
    birthWeightGrams: integer('birth_weight_grams').notNull(),
    weightGrams: integer('weight_grams').notNull(),
    heatSource: text('heat_source', { enum: ['radiant-warmer', 'incubator', 'convertible'] }).notNull(),
    status: text('status', { enum: ['admitted', 'discharged'] })
      .notNull()
      .default('admitted'),
    admittedAt: instant('admitted_at').notNull(),
    dischargedAt: instant('discharged_at'),
    /** The hospital's number for the infant (medical record number); null only on rows older than the field. */
    hospitalNumber: text('hospital_number'),
    /** Administrative sex as recorded on admission; null only on rows older than the field. */
    sex: text('sex', { enum: ['female', 'male', 'indeterminate', 'unknown'] }),
    /** Why the infant left (set at discharge): home, transfer, ward or death. */
    dischargeReason: text('discharge_reason', { enum: ['home', 'transfer', 'ward', 'death'] }),
    /** Where to, as written at discharge (a transfer's unit or hospital, a ward). */
    dischargeDestination: text('discharge_destination'),
    dischargeNote: text('discharge_note'),
  },
  (t) => [index('infants_unit_status').on(t.unitId, t.status)],
);

const infantRef = () =>
  text('infant_id')
    .notNull()
    .references(() => infants.id);

/**
 * Where an infant lay, append-only: one row on admission, one per move, one on discharge (bed
 * null). The bed at an instant is the bed of the latest row at or before it.
 */
export const bedStays = sqliteTable(
  'bed_stays',
  {
    id: text('id').primaryKey(),
    infantId: infantRef(),
    unitId: unitRef(),
    bedId: text('bed_id').references(() => beds.id),
    event: text('event', { enum: ['admitted', 'moved', 'discharged'] }).notNull(),
    at: instant('at').notNull(),
    recordedBy: text('recorded_by').references(() => users.id),
  },
  (t) => [index('bed_stays_infant_at').on(t.infantId, t.at)],
);

/** A nurse's assignment to an infant for one shift; the latest row for (infant, shift) wins. */
export const assignments = sqliteTable(
  'assignments',
  {
    id: text('id').primaryKey(),
    unitId: unitRef(),
    infantId: infantRef(),
    nurseId: text('nurse_id')
      .notNull()
      .references(() => users.id),
    /** Local date of the shift's start in the unit's time zone, YYYY-MM-DD. */
    shiftDate: text('shift_date').notNull(),
    shift: text('shift', { enum: ['day', 'night'] }).notNull(),
    createdBy: text('created_by')
      .notNull()
      .references(() => users.id),
    createdAt: instant('created_at').notNull(),
  },
  (t) => [index('assignments_shift').on(t.unitId, t.shiftDate, t.shift), index('assignments_nurse').on(t.nurseId, t.shiftDate)],
);

export const skinToSkinSessions = sqliteTable(
  'skin_to_skin_sessions',
  {
    id: text('id').primaryKey(),
    infantId: infantRef(),
    unitId: unitRef(),
    startedAt: instant('started_at').notNull(),
    startedBy: text('started_by')
      .notNull()
      .references(() => users.id),
    referenceCenti: integer('reference_centi').notNull(),
    limitCenti: integer('limit_centi').notNull(),
    carer: text('carer'),
    endedAt: instant('ended_at'),
    endedBy: text('ended_by').references(() => users.id),
  },
  (t) => [index('s2s_infant').on(t.infantId, t.startedAt)],
);

export const readings = sqliteTable(
  'readings',
  {
    /** Made by the client, so a retried request is stored once. */
    id: text('id').primaryKey(),
    infantId: infantRef(),
    unitId: unitRef(),
    takenAt: instant('taken_at').notNull(),
    recordedAt: instant('recorded_at').notNull(),
    recordedBy: text('recorded_by')
      .notNull()
      .references(() => users.id),
    probeCenti: integer('probe_centi'),
    remoteCenti: integer('remote_centi'),
    remoteSite: text('remote_site', { enum: ['axilla', 'rectal', 'other'] }),
    airCenti: integer('air_centi'),
    setCenti: integer('set_centi'),
    controlMode: text('control_mode', { enum: ['skin-servo', 'air-servo', 'manual'] }),
    heaterOutputPct: integer('heater_output_pct'),
    heartRate: integer('heart_rate'),
    /** JSON array of heat-stress sign codes. */
    heatSigns: text('heat_signs').notNull().default('[]'),
    note: text('note'),
    /** The unit the nurse typed in, kept so the record shows what was entered. */
    enteredUnit: text('entered_unit', { enum: ['C', 'F'] })
      .notNull()
      .default('C'),
    lateReason: text('late_reason'),
    sessionId: text('session_id').references(() => skinToSkinSessions.id),
    replacesId: text('replaces_id'),
    correctionReason: text('correction_reason', { enum: ['corrected-value', 'entered-in-error', 'late-entry'] }),
    correctionNote: text('correction_note'),
    enteredInError: flag('entered_in_error').notNull().default(false),
    /** Set on rows imported from a file: the upload they came from. */
    uploadId: text('upload_id').references(() => uploads.id),
    /** On imported rows, the nurse named in the file's `taken_by` column; null when the file named nobody. */
    takenBy: text('taken_by').references(() => users.id),
    /** SHA-256 of the request body that created the row, so a retried id with other content is refused. */
    requestHash: text('request_hash'),
    /** Settings charted with the reading: where the probe sits, its cover, the infant's position (shared/vocabulary.ts). */
    probeSite: text('probe_site', { enum: ['abdomen', 'back-or-flank', 'axilla', 'other'] }),
    probeCovered: flag('probe_covered'),
    infantPosition: text('infant_position', { enum: ['supine', 'prone', 'side'] }),
    /** Current weight (g) and incubator humidity (% relative humidity), when charted. */
    weightGrams: integer('weight_grams'),
    humidityPct: integer('humidity_pct'),
  },
  (t) => [index('readings_infant_taken').on(t.infantId, t.takenAt), index('readings_unit_taken').on(t.unitId, t.takenAt), uniqueIndex('readings_replaces').on(t.replacesId)],
);

/** A flag as raised by the rules; its closing is a row in flag_resolutions. */
export const flags = sqliteTable(
  'flags',
  {
    id: text('id').primaryKey(),
    infantId: infantRef(),
    unitId: unitRef(),
    /** The rules' stable key (for example `gap:<reading id>`), unique per infant. */
    key: text('key').notNull(),
    kind: text('kind', {
      enum: ['gap', 'overdue-check', 'heat-stress', 'cold-stress', 'manual-mode', 'skin-to-skin-deviation', 'fever'],
    }).notNull(),
    raisedAt: instant('raised_at').notNull(),
    raisedByReadingId: text('raised_by_reading_id'),
    detail: text('detail').notNull().default('{}'),
    /** Severity when raised (shared/thermal/severity.ts); later changes are flag_events. */
    severity: text('severity', { enum: ['critical', 'urgent', 'caution'] }),
    /** The unit_policy_versions row in force when it was raised (null: the unit's base settings). */
    policyVersionId: text('policy_version_id'),
    createdAt: instant('created_at').notNull(),
  },
  (t) => [uniqueIndex('flags_infant_key').on(t.infantId, t.key), index('flags_unit_raised').on(t.unitId, t.raisedAt)],
);

const flagRef = () =>
  text('flag_id')
    .notNull()
    .references(() => flags.id);

export const flagResolutions = sqliteTable('flag_resolutions', {
  flagId: text('flag_id')
    .primaryKey()
    .references(() => flags.id),
  closedAt: instant('closed_at').notNull(),
  closedByReadingId: text('closed_by_reading_id'),
  /**
   * How it closed: 'recheck', 'check-recorded', 'session-ended', 'reading-corrected', 'discharged',
   * or 'withdrawn' (a late entry or correction showed it should not have been raised; the reason
   * and reading are in flag_events). A withdrawn flag is never counted as a late check.
   */
  how: text('how').notNull(),
  createdAt: instant('created_at').notNull(),
});

/**
 * The lifecycle of each flag, one row per event, never edited: raised (by which reading, at which
 * severity, under which policy version), severity-changed, action, recheck, escalated,
 * acknowledged, closed (by which reading), withdrawn (reason and reading), reopened.
 */
export const flagEvents = sqliteTable(
  'flag_events',
  {
    id: text('id').primaryKey(),
    flagId: flagRef(),
    infantId: infantRef(),
    unitId: unitRef(),
    event: text('event', {
      enum: ['raised', 'severity-changed', 'action', 'action-undone', 'recheck', 'escalated', 'acknowledged', 'closed', 'withdrawn', 'reopened'],
    }).notNull(),
    /** The clinical instant: the reading's taken time, the action's time, when the mail went out. */
    at: instant('at').notNull(),
    readingId: text('reading_id'),
    severity: text('severity', { enum: ['critical', 'urgent', 'caution'] }),
    policyVersionId: text('policy_version_id'),
    detail: text('detail').notNull().default('{}'),
    actorId: text('actor_id'),
    createdAt: instant('created_at').notNull(),
  },
  (t) => [index('flag_events_flag').on(t.flagId, t.createdAt), index('flag_events_infant').on(t.infantId, t.at)],
);

/**
 * What the last evaluation of an infant found, for the views to read (one row per infant,
 * replaced by every sync; derived, not clinical record): the check clocks' next-due instants
 * and the open flags' current severity, detail and recheck clock.
 */
export const infantClocks = sqliteTable('infant_clocks', {
  infantId: text('infant_id')
    .primaryKey()
    .references(() => infants.id),
  unitId: unitRef(),
  computedAt: instant('computed_at').notNull(),
  policyVersionId: text('policy_version_id'),
  dueSoonMinutes: integer('due_soon_minutes').notNull(),
  /** The remote-site check: the last one (or admission) plus the interval in force then. */
  remoteDueAt: instant('remote_due_at'),
  lastRemoteAt: instant('last_remote_at'),
  /** While in manual mode: since when, the next 15-minute check, the output, the limit. */
  manualSince: instant('manual_since'),
  manualDueAt: instant('manual_due_at'),
  manualOutputPct: integer('manual_output_pct'),
  manualLimitMinutes: integer('manual_limit_minutes'),
  /** JSON: [{ flagId, key, severity, detail, recheckDueAt, recheckCountsFrom }] of the open flags. */
  openFlags: text('open_flags').notNull().default('[]'),
  /** JSON: the latest charted values (probe, remote site, control mode, set temperature). */
  latest: text('latest').notNull().default('{}'),
});

export const actions = sqliteTable(
  'actions',
  {
    id: text('id').primaryKey(),
    flagId: flagRef(),
    infantId: infantRef(),
    unitId: unitRef(),
    kind: text('kind').notNull(),
    note: text('note'),
    at: instant('at').notNull(),
    recordedBy: text('recorded_by')
      .notNull()
      .references(() => users.id),
    createdAt: instant('created_at').notNull(),
    /** For 'moved-probe': where the probe went (it becomes the current placement). */
    probeSite: text('probe_site', { enum: ['abdomen', 'back-or-flank', 'axilla', 'other'] }),
  },
  (t) => [index('actions_flag').on(t.flagId), index('actions_infant').on(t.infantId, t.at)],
);

/**
 * An action marked entered in error (a mistaken tap), never edited or deleted: the action row
 * stays and this row says it should not count. Undoing an action that led to a closure reopens
 * the flag (a `reopened` lifecycle event).
 */
export const actionUndos = sqliteTable('action_undos', {
  id: text('id').primaryKey(),
  actionId: text('action_id')
    .notNull()
    .unique()
    .references(() => actions.id),
  flagId: flagRef(),
  infantId: infantRef(),
  unitId: unitRef(),
  undoneBy: text('undone_by')
    .notNull()
    .references(() => users.id),
  note: text('note'),
  at: instant('at').notNull(),
  createdAt: instant('created_at').notNull(),
});

/**
 * An escalation of a flag: once per severity, so a flag that worsens after it escalated (moderate
 * to severe hypothermia) escalates again, and one that stays as it was never does twice.
 */
export const escalations = sqliteTable(
  'escalations',
  {
    id: text('id').primaryKey(),
    flagId: text('flag_id')
      .notNull()
      .references(() => flags.id),
    unitId: unitRef(),
    escalatedAt: instant('escalated_at').notNull(),
    mailedAt: instant('mailed_at'),
    acknowledgedAt: instant('acknowledged_at'),
    acknowledgedBy: text('acknowledged_by').references(() => users.id),
    acknowledgeNote: text('acknowledge_note'),
    /** JSON [{ userId, name, email }]: who it went to (set when it is sent). */
    recipient: text('recipient'),
    /** How it went: 'email'. */
    channel: text('channel'),
    severity: text('severity', { enum: ['critical', 'urgent', 'caution'] }),
  },
  // Rows stored before severities were kept have none (NULLs never collide): see escalatedSeverity.
  (t) => [uniqueIndex('escalations_flag_severity').on(t.flagId, t.severity)],
);

/** An educator's teaching note on a flag; shown to the nurse concerned. */
export const reviews = sqliteTable(
  'reviews',
  {
    id: text('id').primaryKey(),
    flagId: flagRef(),
    unitId: unitRef(),
    reviewerId: text('reviewer_id')
      .notNull()
      .references(() => users.id),
    note: text('note').notNull(),
    createdAt: instant('created_at').notNull(),
  },
  (t) => [index('reviews_flag').on(t.flagId)],
);

/**
 * What happened to a teaching note after it was written, and review outcomes without a note:
 * append-only (UPDATE/DELETE refused). `amended` carries the note's new text (version n+1),
 * `withdrawn` an optional reason, `acknowledged` the version the nurse read, and
 * `no-teaching-point` closes a review item without a note (review_id null). The review status
 * is separate from the flag's own lifecycle (flag_events).
 */
export const reviewEvents = sqliteTable(
  'review_events',
  {
    id: text('id').primaryKey(),
    flagId: flagRef(),
    unitId: unitRef(),
    reviewId: text('review_id').references(() => reviews.id),
    event: text('event', { enum: ['amended', 'withdrawn', 'acknowledged', 'no-teaching-point'] }).notNull(),
    note: text('note'),
    version: integer('version'),
    actorId: text('actor_id')
      .notNull()
      .references(() => users.id),
    createdAt: instant('created_at').notNull(),
  },
  (t) => [index('review_events_flag').on(t.flagId), index('review_events_review').on(t.reviewId)],
);

export const uploads = sqliteTable(
  'uploads',
  {
    id: text('id').primaryKey(),
    kind: text('kind', { enum: ['roster', 'readings'] }).notNull(),
    unitId: text('unit_id').references(() => units.id),
    filename: text('filename').notNull(),
    storedName: text('stored_name').notNull(),
    sha256: text('sha256').notNull(),
    sizeBytes: integer('size_bytes').notNull(),
    rowCount: integer('row_count').notNull().default(0),
    status: text('status', { enum: ['previewed', 'imported', 'rejected'] }).notNull(),
    uploadedBy: text('uploaded_by')
      .notNull()
      .references(() => users.id),
    createdAt: instant('created_at').notNull(),
    importedAt: instant('imported_at'),
  },
  (t) => [index('uploads_sha').on(t.kind, t.sha256)],
);

/** Mail caught by the local fake SMTP server (development and tests). */
export const caughtMail = sqliteTable('caught_mail', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  receivedAt: instant('received_at').notNull(),
  from: text('from_address').notNull(),
  to: text('to_addresses').notNull(),
  subject: text('subject').notNull(),
  text: text('text_body').notNull(),
  html: text('html_body'),
  /** The user whose action sent it (an invitation's admin); null for the system's own mail. */
  sentBy: text('sent_by'),
});

/** Every change and every chart read; each row carries the hash of the one before it. */
export const auditEvents = sqliteTable(
  'audit_events',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    at: instant('at').notNull(),
    actorId: text('actor_id'),
    action: text('action').notNull(),
    entityType: text('entity_type').notNull(),
    entityId: text('entity_id'),
    unitId: text('unit_id'),
    before: text('before'),
    after: text('after'),
    prevHash: text('prev_hash').notNull(),
    hash: text('hash').notNull(),
  },
  (t) => [index('audit_entity').on(t.entityType, t.entityId)],
);

export const settings = sqliteTable('app_settings', {
  key: text('key').primaryKey(),
  value: text('value').notNull(),
  updatedAt: instant('updated_at')
    .notNull()
    .default(sql`(unixepoch() * 1000)`),
});

/**
 * An empty bed being warmed for an expected admission, one row per event, never edited: `started`
 * (heat source, control mode, set temperature, since when, whom the bed is for) and `ended`
 * (the infant was admitted into it, or the warming was stopped). The bed's warming is its latest
 * row when that row is `started`.
 */
export const bedWarmings = sqliteTable(
  'bed_warmings',
  {
    id: text('id').primaryKey(),
    unitId: unitRef(),
    bedId: text('bed_id')
      .notNull()
      .references(() => beds.id),
    event: text('event', { enum: ['started', 'ended'] }).notNull(),
    heatSource: text('heat_source', { enum: ['radiant-warmer', 'incubator', 'convertible'] }),
    controlMode: text('control_mode', { enum: ['skin-servo', 'air-servo', 'manual'] }),
    setCenti: integer('set_centi'),
    /** When the heat source was switched on (the clinical instant), for `started`. */
    since: instant('since'),
    /** Whom the bed is for, as the charge nurse wrote it (no more than a name or a note). */
    expectedInfant: text('expected_infant'),
    /** For `ended`: admitted or stopped; the infant admitted into the bed. */
    endReason: text('end_reason', { enum: ['admitted', 'stopped'] }),
    infantId: text('infant_id').references(() => infants.id),
    enteredUnit: text('entered_unit', { enum: ['C', 'F'] }),
    recordedBy: text('recorded_by').references(() => users.id),
    createdAt: instant('created_at').notNull(),
  },
  (t) => [index('bed_warmings_bed').on(t.bedId, t.createdAt)],
);

/**
 * The handover plan for one infant and shift, as written on the handover screen. Append-only: a
 * new version is a new row; the latest row for (infant, shift date, shift) is the plan.
 */
export const handoverPlans = sqliteTable(
  'handover_plans',
  {
    id: text('id').primaryKey(),
    unitId: unitRef(),
    infantId: infantRef(),
    shiftDate: text('shift_date').notNull(),
    shift: text('shift', { enum: ['day', 'night'] }).notNull(),
    plan: text('plan').notNull(),
    writtenBy: text('written_by').references(() => users.id),
    createdAt: instant('created_at').notNull(),
  },
  (t) => [index('handover_plans_infant').on(t.infantId, t.shiftDate, t.shift, t.createdAt)],
);

/**
 * A change of the probe's placement charted on its own (the probe moved, the infant turned),
 * append-only. Readings carry the placement too; the current placement is the latest of both.
 */
export const placementChanges = sqliteTable(
  'placement_changes',
  {
    /** Made by the client, so a retried request is stored once. */
    id: text('id').primaryKey(),
    infantId: infantRef(),
    unitId: unitRef(),
    /** The clinical instant of the change. */
    at: instant('at').notNull(),
    probeSite: text('probe_site', { enum: ['abdomen', 'back-or-flank', 'axilla', 'other'] }),
    probeCovered: flag('probe_covered'),
    infantPosition: text('infant_position', { enum: ['supine', 'prone', 'side'] }),
    recordedBy: text('recorded_by')
      .notNull()
      .references(() => users.id),
    createdAt: instant('created_at').notNull(),
  },
  (t) => [index('placement_changes_infant').on(t.infantId, t.at)],
);

/**
 * The infant's current placement and its prompt (shared/thermal/placement.ts), as stored by the
 * last write that could change it: one row per infant, derived from readings, placement changes
 * and moved-probe actions. The views read it and never judge the placement themselves.
 */
export const infantPlacements = sqliteTable('infant_placements', {
  infantId: text('infant_id')
    .primaryKey()
    .references(() => infants.id),
  unitId: unitRef(),
  probeSite: text('probe_site', { enum: ['abdomen', 'back-or-flank', 'axilla', 'other'] }),
  probeCovered: flag('probe_covered'),
  infantPosition: text('infant_position', { enum: ['supine', 'prone', 'side'] }),
  /** When the latest of these was charted (the clinical instant). */
  chartedAt: instant('charted_at').notNull(),
  /** The placement's prompt code, or null. */
  prompt: text('prompt', { enum: ['probe-under-prone-infant'] }),
  computedAt: instant('computed_at').notNull(),
});
