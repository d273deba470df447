import { sql } from 'drizzle-orm'
import {
  type AnyPgColumn,
  bigint,
  bigserial,
  boolean,
  check,
  date,
  index,
  integer,
  jsonb,
  numeric,
  pgEnum,
  pgTable,
  primaryKey,
  serial,
  text,
  timestamp,
  uniqueIndex,
  varchar,
} from 'drizzle-orm/pg-core'
import type { RuleProfile } from '#shared/rules/profile'
import type { ProtestKind, ProtestOutcome, ProtestVoids } from '#shared/rules/protests'
import type { PlanRequest } from '#shared/schemas/planner'
import type { DeviceLayout } from '#shared/rules/device-file'
import type { ChecklistTemplate } from '#shared/inspection/template'
// Relative, not '#shared': drizzle-kit reads this file outside Nuxt.
import {
  DECISIONS,
  DIRECTIONS,
  EVENT_ROLES,
  EVIDENCE_KINDS,
  ITEM_RESULTS,
  POWER_SOURCES,
  RUN_STATUSES,
  RECORD_UNITS,
  SIGNED_KINDS,
  START_KINDS,
  STREAMLINING,
  SYSTEM_ROLES,
  TIME_BASES,
  TOKEN_PURPOSES,
  type EventRole,
  type OfficialFunction,
} from '../../shared/constants'

const createdAt = () => timestamp('created_at', { withTimezone: true }).notNull().defaultNow()

export const eventRole = pgEnum('event_role', EVENT_ROLES)
export const tokenPurpose = pgEnum('token_purpose', TOKEN_PURPOSES)
export const powerSource = pgEnum('power_source', POWER_SOURCES)
export const streamlining = pgEnum('streamlining', STREAMLINING)
export const startKind = pgEnum('start_kind', START_KINDS)
export const systemRole = pgEnum('system_role', SYSTEM_ROLES)
export const runDirection = pgEnum('run_direction', DIRECTIONS)
export const runStatus = pgEnum('run_status', RUN_STATUSES)
export const signedKind = pgEnum('signed_kind', SIGNED_KINDS)
export const recordUnit = pgEnum('record_unit', RECORD_UNITS)
export const decisionKind = pgEnum('decision_kind', DECISIONS)
export const itemResult = pgEnum('item_result', ITEM_RESULTS)
export const evidenceKind = pgEnum('evidence_kind', EVIDENCE_KINDS)

export const users = pgTable('users', {
  id: serial('id').primaryKey(),
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  passwordHash: text('password_hash'),
  isAdmin: boolean('is_admin').notNull().default(false),
  createdAt: createdAt(),
  passwordChangedAt: timestamp('password_changed_at', { withTimezone: true }),
  /** Raised to end every session of the person (a new password, "sign out everywhere"). */
  sessionVersion: integer('session_version').notNull().default(0),
})

export const events = pgTable('events', {
  id: serial('id').primaryKey(),
  name: text('name').notNull(),
  venue: text('venue').notNull(),
  startsOn: date('starts_on').notNull(),
  endsOn: date('ends_on').notNull(),
  timeZone: text('time_zone').notNull(),
  profileId: text('profile_id').notNull(),
  /** The rule profile in force, frozen when the event was created or its profile last set. */
  profile: jsonb('profile').$type<RuleProfile>().notNull(),
  /** Bumped by triggers whenever anything the live results read changes (drizzle/0002). */
  dataVersion: bigint('data_version', { mode: 'number' }).notNull().default(0),
  /** The organiser opts in: a public board of runs and results, with no personal data, for spectators and press. */
  publicBoard: boolean('public_board').notNull().default(false),
  createdBy: integer('created_by').references(() => users.id),
  createdAt: createdAt(),
})

export const teams = pgTable(
  'teams',
  {
    id: serial('id').primaryKey(),
    eventId: integer('event_id')
      .notNull()
      .references(() => events.id),
    name: text('name').notNull(),
    createdAt: createdAt(),
  },
  t => [uniqueIndex('teams_event_name').on(t.eventId, t.name)],
)

export const memberships = pgTable(
  'memberships',
  {
    id: serial('id').primaryKey(),
    eventId: integer('event_id')
      .notNull()
      .references(() => events.id),
    userId: integer('user_id')
      .notNull()
      .references(() => users.id),
    role: eventRole('role').notNull(),
    /** For the team role: the team this person enters for. */
    teamId: integer('team_id').references(() => teams.id),
    invitedBy: integer('invited_by').references(() => users.id),
    createdAt: createdAt(),
  },
  t => [
    uniqueIndex('memberships_event_user_role').on(t.eventId, t.userId, t.role),
    index('memberships_user').on(t.userId),
  ],
)

/**
 * A signed-in session as the server knows it: the cookie names its id; signing out ends the row, so the same
 * cookie is refused afterwards. Only the SHA-256 of the id is kept.
 */
export const sessions = pgTable('sessions', {
  idSha256: text('id_sha256').primaryKey(),
  userId: integer('user_id')
    .notNull()
    .references(() => users.id),
  createdAt: createdAt(),
  endedAt: timestamp('ended_at', { withTimezone: true }),
}, t => [index('sessions_user').on(t.userId)])

/** Single-use links for invitations and password resets; only the SHA-256 of the token is kept. */
export const authTokens = pgTable('auth_tokens', {
  id: serial('id').primaryKey(),
  userId: integer('user_id')
    .notNull()
    .references(() => users.id),
  purpose: tokenPurpose('purpose').notNull(),
  tokenHash: text('token_hash').notNull().unique(),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true }),
  createdAt: createdAt(),
})

/** Kept in PostgreSQL so the sign-in limit holds across several app servers. */
export const loginAttempts = pgTable(
  'login_attempts',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    email: text('email').notNull(),
    succeeded: boolean('succeeded').notNull(),
    at: timestamp('at', { withTimezone: true })
      .notNull()
      .default(sql`now()`),
  },
  t => [index('login_attempts_email_at').on(t.email, t.at)],
)

export const courses = pgTable('courses', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id')
    .notNull()
    .references(() => events.id),
  name: text('name').notNull(),
  /** Direction of travel of the "out" runs, degrees from true north. */
  headingDeg: numeric('heading_deg', { precision: 6, scale: 2 }).notNull(),
  surface: text('surface').notNull(),
  /** From the survey certificate: how far a measured distance may differ from its nominal length. */
  surveyToleranceMm: integer('survey_tolerance_mm').notNull().default(10),
  createdAt: createdAt(),
})

export const traps = pgTable(
  'traps',
  {
    id: serial('id').primaryKey(),
    courseId: integer('course_id')
      .notNull()
      .references(() => courses.id),
    label: text('label').notNull(),
    /** Surveyed position, metres from the start line. */
    positionM: numeric('position_m', { precision: 12, scale: 3 }).notNull(),
    elevationM: numeric('elevation_m', { precision: 9, scale: 3 }).notNull(),
    /** Set when the organiser retires it, with the reason in the set-up history; never deleted. */
    retiredAt: timestamp('retired_at', { withTimezone: true }),
  },
  t => [uniqueIndex('traps_course_label').on(t.courseId, t.label).where(sql`retired_at is null`)],
)

export const machines = pgTable('machines', {
  id: serial('id').primaryKey(),
  teamId: integer('team_id')
    .notNull()
    .references(() => teams.id),
  name: text('name').notNull(),
  power: powerSource('power').notNull(),
  declaredMassKg: numeric('declared_mass_kg', { precision: 8, scale: 1 }).notNull(),
  division: streamlining('division').notNull(),
  createdAt: createdAt(),
})

export const riders = pgTable('riders', {
  id: serial('id').primaryKey(),
  teamId: integer('team_id')
    .notNull()
    .references(() => teams.id),
  name: text('name').notNull(),
  licenceNo: text('licence_no').notNull(),
  licenceExpires: date('licence_expires').notNull(),
  /** The licence grade (speed bracket) where the profile grades licences. */
  licenceGrade: text('licence_grade'),
  /** The medical's validity, where the profile requires one. */
  medicalExpires: date('medical_expires'),
  createdAt: createdAt(),
})

/** A measured distance between two traps of one course (flying kilometre, flying mile, standing start). */
export const measuredDistances = pgTable(
  'measured_distances',
  {
    id: serial('id').primaryKey(),
    courseId: integer('course_id')
      .notNull()
      .references(() => courses.id),
    label: text('label').notNull(),
    start: startKind('start').notNull(),
    nominalM: numeric('nominal_m', { precision: 12, scale: 3 }).notNull(),
    entryTrapId: integer('entry_trap_id')
      .notNull()
      .references(() => traps.id),
    exitTrapId: integer('exit_trap_id')
      .notNull()
      .references(() => traps.id),
    /** Set when the organiser retires it, with the reason in the set-up history; never deleted. */
    retiredAt: timestamp('retired_at', { withTimezone: true }),
  },
  t => [uniqueIndex('distances_course_label').on(t.courseId, t.label).where(sql`retired_at is null`)],
)

export const timingSystems = pgTable(
  'timing_systems',
  {
    id: serial('id').primaryKey(),
    eventId: integer('event_id')
      .notNull()
      .references(() => events.id),
    name: text('name').notNull(),
    role: systemRole('role').notNull(),
    /** Resolution: 1000 is 1/1000 s. Readings are kept as integers of these ticks. */
    ticksPerSecond: integer('ticks_per_second').notNull(),
    description: text('description').notNull().default(''),
    /** The equipment's stated agreement with an independent system, seconds. */
    toleranceS: numeric('tolerance_s', { precision: 8, scale: 6 }).notNull(),
    calibratedOn: date('calibrated_on').notNull(),
    calibrationExpires: date('calibration_expires').notNull(),
    /** The clock its times of day are read on: the event's local time or UTC. */
    timeBase: text('time_base', { enum: TIME_BASES }).notNull().default('local'),
    /** How and when its clock was set (to GPS time, to the other system…), in the timekeeper's words. */
    synchronisation: text('synchronisation').notNull().default(''),
    /** Set when the organiser retires it, with the reason in the set-up history; never deleted. */
    retiredAt: timestamp('retired_at', { withTimezone: true }),
  },
  t => [uniqueIndex('timing_systems_event_role').on(t.eventId, t.role).where(sql`retired_at is null`)],
)

/**
 * How a timing system's own event list reads: its columns and separator, and which device channel is which
 * trap. Set by the organiser or a timekeeper, kept for the next file; a setting, not a signed record.
 */
export const deviceLayouts = pgTable('device_layouts', {
  timingSystemId: integer('timing_system_id')
    .primaryKey()
    .references(() => timingSystems.id),
  layout: jsonb('layout').$type<DeviceLayout>().notNull(),
  updatedBy: integer('updated_by')
    .notNull()
    .references(() => users.id),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
})

/** The organiser's copy of the record book: the standing record per class and distance. */
export const standingRecords = pgTable(
  'standing_records',
  {
    id: serial('id').primaryKey(),
    eventId: integer('event_id')
      .notNull()
      .references(() => events.id),
    className: text('class_name').notNull(),
    distanceLabel: text('distance_label').notNull(),
    /** The record as published: its exact decimal and its unit, compared in that unit. */
    speed: numeric('speed').notNull(),
    unit: recordUnit('unit').notNull().default('km/h'),
    setOn: date('set_on'),
    /** For a vacant class: the minimum the organiser sets, which a first record must reach; not a record. */
    minimum: boolean('minimum').notNull().default(false),
    note: text('note').notNull().default(''),
    /** A result ratified at this event stands from the moment of its ratification; null for one entered by hand. */
    dossierId: integer('dossier_id').references(() => dossiers.id),
    setAt: timestamp('set_at', { withTimezone: true }),
    /** Set when the organiser retires it, with the reason in the set-up history; never deleted. */
    retiredAt: timestamp('retired_at', { withTimezone: true }),
  },
  t => [
    uniqueIndex('standing_records_event_class_distance')
      .on(t.eventId, t.className, t.distanceLabel)
      .where(sql`dossier_id is null and retired_at is null`),
  ],
)

/** What set-up changes are corrected or retired, with the values before and after and the reason. */
export const SETUP_SUBJECTS = ['trap', 'distance', 'timing-system', 'record', 'event', 'entry'] as const
export type SetupSubject = (typeof SETUP_SUBJECTS)[number]

/**
 * The history of set-up and entry corrections: every change to a trap, a measured distance, a timing
 * system, a standing record, the event or an entry, with the values before and after, who and why.
 * Append-only, like readings.
 */
export const setupChanges = pgTable(
  'setup_changes',
  {
    id: serial('id').primaryKey(),
    eventId: integer('event_id')
      .notNull()
      .references(() => events.id),
    subject: text('subject').$type<SetupSubject>().notNull(),
    subjectId: integer('subject_id').notNull(),
    action: text('action').$type<'edit' | 'retire'>().notNull(),
    before: jsonb('before').notNull(),
    after: jsonb('after'),
    reason: text('reason').notNull(),
    changedBy: integer('changed_by')
      .notNull()
      .references(() => users.id),
    changedAt: timestamp('changed_at', { withTimezone: true }).notNull().defaultNow(),
  },
  t => [index('setup_changes_subject').on(t.eventId, t.subject, t.subjectId)],
)

/** A team's request to change its entry after its first run: decided by the organiser. */
export const entryChangeRequests = pgTable('entry_change_requests', {
  id: serial('id').primaryKey(),
  entryId: integer('entry_id')
    .notNull()
    .references(() => entries.id),
  changes: jsonb('changes').notNull(),
  reason: text('reason').notNull(),
  requestedBy: integer('requested_by')
    .notNull()
    .references(() => users.id),
  requestedAt: timestamp('requested_at', { withTimezone: true }).notNull().defaultNow(),
  status: text('status').$type<'pending' | 'approved' | 'refused'>().notNull().default('pending'),
  decidedBy: integer('decided_by').references(() => users.id),
  decidedAt: timestamp('decided_at', { withTimezone: true }),
  decisionNote: text('decision_note'),
})

/** A machine and rider entered for a record: a class at a measured distance. */
export const entries = pgTable('entries', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id')
    .notNull()
    .references(() => events.id),
  teamId: integer('team_id')
    .notNull()
    .references(() => teams.id),
  machineId: integer('machine_id')
    .notNull()
    .references(() => machines.id),
  riderId: integer('rider_id')
    .notNull()
    .references(() => riders.id),
  className: text('class_name').notNull(),
  /** The first distance the entry claims (kept for the references that name one). */
  distanceId: integer('distance_id')
    .notNull()
    .references(() => measuredDistances.id),
  /**
   * Every distance the entry claims, the first first: one pass over the course yields a result for each
   * (the flying kilometre inside the flying mile). Checked against the course and the profile on entry.
   */
  distanceIds: integer('distance_ids').array().notNull(),
  createdAt: createdAt(),
}, t => [check('entries_first_claim', sql`${t.distanceIds}[1] = ${t.distanceId}`)])

/** A pair of runs under the profile frozen when the attempt opened. */
export const attempts = pgTable('attempts', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id')
    .notNull()
    .references(() => events.id),
  entryId: integer('entry_id')
    .notNull()
    .references(() => entries.id),
  profile: jsonb('profile').$type<RuleProfile>().notNull(),
  createdAt: createdAt(),
})

export const runs = pgTable(
  'runs',
  {
    id: serial('id').primaryKey(),
    eventId: integer('event_id')
      .notNull()
      .references(() => events.id),
    attemptId: integer('attempt_id')
      .notNull()
      .references(() => attempts.id),
    direction: runDirection('direction').notNull(),
    /** A flying pass, or a standing start from rest at the start line; a distance counts runs of its own kind. */
    start: startKind('start').notNull().default('flying'),
    startedAt: timestamp('started_at', { withTimezone: true }).notNull(),
    status: runStatus('status').notNull().default('open'),
    abortedReason: text('aborted_reason'),
    abortedBy: integer('aborted_by').references(() => users.id),
    /** The speed the run expected at the start line (km/h), where said or declared. */
    expectedKmh: numeric('expected_kmh'),
    /** The grade a licence upgrade run is made for; null for an ordinary run. */
    licenceUpgrade: text('licence_upgrade'),
    /** The clerk of the course's signed override this run started under, if any. */
    overrideId: integer('override_id'),
    createdBy: integer('created_by')
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
  },
  t => [index('runs_event').on(t.eventId)],
)

/**
 * A trap time of one timing system, as integer ticks since local midnight of the run's day.
 * Never updated: a correction is a new row naming the one it supersedes, with a reason.
 */
export const readings = pgTable(
  'readings',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    runId: integer('run_id')
      .notNull()
      .references(() => runs.id),
    trapId: integer('trap_id')
      .notNull()
      .references(() => traps.id),
    systemId: integer('system_id')
      .notNull()
      .references(() => timingSystems.id),
    ticks: bigint('ticks', { mode: 'bigint' }).notNull(),
    supersedesId: bigint('supersedes_id', { mode: 'number' }),
    reason: text('reason'),
    /** The timing device's own file this time was imported from (evidence of kind data log). */
    sourceEvidenceId: integer('source_evidence_id').references((): AnyPgColumn => evidence.id),
    enteredBy: integer('entered_by')
      .notNull()
      .references(() => users.id),
    enteredAt: timestamp('entered_at', { withTimezone: true }).notNull().defaultNow(),
  },
  t => [
    index('readings_run').on(t.runId),
    uniqueIndex('readings_supersedes_once').on(t.supersedesId),
    uniqueIndex('readings_first_entry')
      .on(t.runId, t.trapId, t.systemId)
      .where(sql`supersedes_id is null`),
  ],
)

/** Weather at a run from the course anemometer; the latest reading of a run counts. */
export const weather = pgTable('weather', {
  id: serial('id').primaryKey(),
  runId: integer('run_id')
    .notNull()
    .references(() => runs.id),
  windSpeedMs: numeric('wind_speed_ms', { precision: 6, scale: 2 }).notNull(),
  windFromDeg: numeric('wind_from_deg', { precision: 6, scale: 2 }).notNull(),
  temperatureC: numeric('temperature_c', { precision: 5, scale: 1 }),
  pressureHpa: numeric('pressure_hpa', { precision: 6, scale: 1 }),
  enteredBy: integer('entered_by')
    .notNull()
    .references(() => users.id),
  enteredAt: timestamp('entered_at', { withTimezone: true }).notNull().defaultNow(),
})

/**
 * One signing mechanism for everything signed: who, when, the typed name, and the SHA-256 of the
 * record's canonical content (kept beside it). PostgreSQL refuses UPDATE and DELETE of these rows.
 */
/** What a passkey signed with, as the browser sent it (base64url). */
export interface PasskeyAssertion {
  credentialId: string
  authenticatorData: string
  clientDataJSON: string
  signature: string
  userHandle: string | null
  /**
   * The challenge signed: SHA-256 of (the content's digest, "." and the server's nonce) where a nonce is kept, else
   * (signatures made before challenges were issued) the content's digest itself, base64url.
   */
  challenge: string
  /** The server's single-use nonce the challenge was made with. */
  nonce?: string
}

export const signatures = pgTable(
  'signatures',
  {
    id: serial('id').primaryKey(),
    kind: signedKind('kind').notNull(),
    subjectId: integer('subject_id').notNull(),
    eventId: integer('event_id')
      .notNull()
      .references(() => events.id),
    signerId: integer('signer_id')
      .notNull()
      .references(() => users.id),
    typedName: text('typed_name').notNull(),
    /** The signer's own words on why the typed name differs from the name on their account. */
    nameNote: text('name_note'),
    content: jsonb('content').notNull(),
    contentSha256: text('content_sha256').notNull(),
    /** Why a signed record is superseded or reopened. */
    reason: text('reason'),
    /** A signature drawn on a canvas, as a PNG data URL, when the signer drew one. */
    drawingPng: text('drawing_png'),
    supersedesId: integer('supersedes_id'),
    signedAt: timestamp('signed_at', { withTimezone: true }).notNull().defaultNow(),
    /** How the signer proved it was them: their password again (the weaker kind), or a passkey. */
    method: text('method').$type<'password' | 'passkey' | 'in-person'>().notNull().default('password'),
    /**
     * A passkey's assertion over the SHA-256 of the canonical content (the record's own new id left out):
     * anyone can check later, with the stored public key, that this device signed exactly that content.
     */
    assertion: jsonb('assertion').$type<PasskeyAssertion>(),
  },
  t => [
    index('signatures_subject').on(t.kind, t.subjectId),
    uniqueIndex('signatures_supersedes_once').on(t.supersedesId),
  ],
)

/** An event's copy of a checklist template, adapted by the organiser; versions are kept. */
export const checklists = pgTable('checklists', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id')
    .notNull()
    .references(() => events.id),
  baseId: text('base_id').notNull(),
  content: jsonb('content').$type<ChecklistTemplate>().notNull(),
  note: text('note').notNull().default(''),
  /** A scrutineer's signature, needed where the copy leaves out safety items; immutable once signed. */
  signatureId: integer('signature_id').references(() => signatures.id),
  createdBy: integer('created_by')
    .notNull()
    .references(() => users.id),
  createdAt: createdAt(),
})

/**
 * A technical inspection of an entry against the checklist version it used (kept in the row). A
 * re-inspection is a new row pointing at the previous one. Signed rows are immutable (trigger).
 */
export const inspections = pgTable(
  'inspections',
  {
    id: serial('id').primaryKey(),
    eventId: integer('event_id')
      .notNull()
      .references(() => events.id),
    entryId: integer('entry_id')
      .notNull()
      .references(() => entries.id),
    checklist: jsonb('checklist').$type<ChecklistTemplate>().notNull(),
    busVoltageV: numeric('bus_voltage_v', { precision: 7, scale: 1 }),
    busKind: text('bus_kind'),
    /** The top speed the team declares the machine may reach, km/h exactly (tyres, parachutes). */
    declaredKmh: numeric('declared_kmh'),
    /** The streamlining division the scrutineer saw (the class check uses it); null on inspections from before. */
    division: streamlining('division'),
    previousId: integer('previous_id'),
    signatureId: integer('signature_id').references(() => signatures.id),
    createdBy: integer('created_by')
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
  },
  t => [index('inspections_entry').on(t.entryId)],
)

export const inspectionAnswers = pgTable(
  'inspection_answers',
  {
    id: serial('id').primaryKey(),
    inspectionId: integer('inspection_id')
      .notNull()
      .references(() => inspections.id),
    itemKey: text('item_key').notNull(),
    result: itemResult('result').notNull(),
    /** A measurement in the item's unit, exactly as converted; `enteredAs` keeps what was typed. */
    value: numeric('value'),
    enteredAs: text('entered_as'),
    note: text('note'),
    updatedBy: integer('updated_by')
      .notNull()
      .references(() => users.id),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  t => [uniqueIndex('inspection_answers_item').on(t.inspectionId, t.itemKey)],
)

/** An official's signed statement on an attempt; withdrawn only by a new signed statement. */
export const statements = pgTable(
  'witness_statements',
  {
    id: serial('id').primaryKey(),
    eventId: integer('event_id')
      .notNull()
      .references(() => events.id),
    attemptId: integer('attempt_id')
      .notNull()
      .references(() => attempts.id),
    authorId: integer('author_id')
      .notNull()
      .references(() => users.id),
    /** The runs seen, in the official's own words (beside the runs ticked; empty where only ticked). */
    runsSeen: text('runs_seen').notNull(),
    /** The runs of the attempt the official ticked as seen; empty on statements from before ticks were kept. */
    runIdsSeen: integer('run_ids_seen').array().notNull().default(sql`'{}'::integer[]`),
    position: text('position').notNull(),
    conditions: text('conditions').notNull(),
    irregularities: text('irregularities').notNull(),
    /** For a withdrawal: the statement it withdraws and why. */
    withdrawsId: integer('withdraws_id'),
    reason: text('reason'),
    signatureId: integer('signature_id').references(() => signatures.id),
    createdAt: createdAt(),
  },
  t => [uniqueIndex('statements_withdrawn_once').on(t.withdrawsId)],
)

/**
 * A file of evidence, stored once by its SHA-256 (several rows may share one stored file), and
 * what it belongs to. A row is written only after its file is complete and in place.
 */
export const evidence = pgTable(
  'evidence',
  {
    id: serial('id').primaryKey(),
    eventId: integer('event_id')
      .notNull()
      .references(() => events.id),
    kind: evidenceKind('kind').notNull(),
    originalName: text('original_name').notNull(),
    mediaType: text('media_type').notNull(),
    size: bigint('size', { mode: 'number' }).notNull(),
    sha256: text('sha256').notNull(),
    courseId: integer('course_id').references(() => courses.id),
    timingSystemId: integer('timing_system_id').references(() => timingSystems.id),
    entryId: integer('entry_id').references(() => entries.id),
    attemptId: integer('attempt_id').references(() => attempts.id),
    runId: integer('run_id').references(() => runs.id),
    inspectionId: integer('inspection_id').references(() => inspections.id),
    itemKey: text('item_key'),
    uploadedBy: integer('uploaded_by')
      .notNull()
      .references(() => users.id),
    uploadedAt: timestamp('uploaded_at', { withTimezone: true }).notNull().defaultNow(),
  },
  t => [index('evidence_event').on(t.eventId), index('evidence_sha256').on(t.sha256)],
)

/** A person's passkey (WebAuthn credential): its public key, to check their signatures with it, ever after. */
export const passkeys = pgTable('passkeys', {
  id: serial('id').primaryKey(),
  userId: integer('user_id').notNull().references(() => users.id),
  /** The credential id, base64url. */
  credentialId: text('credential_id').notNull().unique(),
  /** The COSE public key, base64url. */
  publicKey: text('public_key').notNull(),
  counter: integer('counter').notNull().default(0),
  transports: jsonb('transports').$type<string[]>().notNull().default([]),
  name: text('name').notNull(),
  createdAt: createdAt(),
})

/** A passkey revoked by its owner: it signs nothing more; what it signed before stays checkable. Never undone. */
export const passkeyRevocations = pgTable('passkey_revocations', {
  id: serial('id').primaryKey(),
  passkeyId: integer('passkey_id').notNull().unique().references(() => passkeys.id),
  reason: text('reason').notNull(),
  revokedAt: timestamp('revoked_at', { withTimezone: true }).notNull().defaultNow(),
})

/**
 * A signing challenge the server issued: random, for one signer and one act over one content digest, used once
 * within minutes. The passkey signs SHA-256(digest + "." + nonce), so no answer is ever good twice.
 */
export const signingChallenges = pgTable('signing_challenges', {
  id: serial('id').primaryKey(),
  userId: integer('user_id').notNull().references(() => users.id),
  kind: text('kind').notNull(),
  digest: text('digest').notNull(),
  nonce: text('nonce').notNull(),
  challenge: text('challenge').notNull().unique(),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true }),
})

/** A registration's challenge, used once within minutes. */
export const passkeyChallenges = pgTable('passkey_challenges', {
  userId: integer('user_id').primaryKey().references(() => users.id),
  challenge: text('challenge').notNull(),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
})

/**
 * Every key that has sealed dossiers here: its Ed25519 public key and its certificate for the PDF
 * signature. The current one has no `retiredAt`; retired ones stay so older dossiers still verify.
 */
export const sealKeys = pgTable('seal_keys', {
  keyId: text('key_id').primaryKey(),
  publicKeyPem: text('public_key_pem').notNull(),
  /** The signing certificate and its issuers, PEM; none for a key from before PDF signatures. */
  certificatePem: text('certificate_pem'),
  certificateSha256: text('certificate_sha256'),
  firstUsedAt: timestamp('first_used_at', { withTimezone: true }).notNull().defaultNow(),
  retiredAt: timestamp('retired_at', { withTimezone: true }),
})

/**
 * A sealed dossier: the canonical manifest, its Ed25519 seal and the SHA-256 of the PDF issued.
 * Never changed (trigger); a new version supersedes it and both are kept.
 */
export const dossiers = pgTable(
  'dossiers',
  {
    id: serial('id').primaryKey(),
    eventId: integer('event_id')
      .notNull()
      .references(() => events.id),
    attemptId: integer('attempt_id')
      .notNull()
      .references(() => attempts.id),
    /** The measured distance whose result the dossier claims; each claimed distance has its own dossier. */
    distanceId: integer('distance_id')
      .notNull()
      .references(() => measuredDistances.id),
    version: integer('version').notNull(),
    manifest: jsonb('manifest').notNull(),
    manifestSha256: text('manifest_sha256').notNull(),
    seal: text('seal').notNull(),
    keyFingerprint: text('key_fingerprint').notNull(),
    pdfSha256: text('pdf_sha256').notNull(),
    pdfSize: bigint('pdf_size', { mode: 'number' }).notNull(),
    /** The public copy: the same figures and seals without personal data (licence number and scan). */
    publicPdfSha256: text('public_pdf_sha256'),
    publicPdfSize: bigint('public_pdf_size', { mode: 'number' }),
    publicManifestSha256: text('public_manifest_sha256'),
    supersedesId: integer('supersedes_id'),
    createdBy: integer('created_by')
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
  },
  t => [
    uniqueIndex('dossiers_attempt_distance_version').on(t.attemptId, t.distanceId, t.version),
    index('dossiers_pdf_sha256').on(t.pdfSha256),
  ],
)

export const submissions = pgTable('submissions', {
  id: serial('id').primaryKey(),
  dossierId: integer('dossier_id')
    .notNull()
    .references(() => dossiers.id)
    .unique(),
  submittedBy: integer('submitted_by')
    .notNull()
    .references(() => users.id),
  submittedAt: timestamp('submitted_at', { withTimezone: true }).notNull().defaultNow(),
})

/** The officials' decision on a submitted dossier, signed; one per dossier. */
export const decisions = pgTable('decisions', {
  id: serial('id').primaryKey(),
  dossierId: integer('dossier_id')
    .notNull()
    .references(() => dossiers.id)
    .unique(),
  decision: decisionKind('decision').notNull(),
  reasons: text('reasons').notNull(),
  signatureId: integer('signature_id')
    .notNull()
    .references(() => signatures.id),
  decidedBy: integer('decided_by')
    .notNull()
    .references(() => users.id),
  decidedAt: timestamp('decided_at', { withTimezone: true }).notNull().defaultNow(),
})

/** Mail is written here first and sent after; what could not be sent is tried again later. */
export const mailOutbox = pgTable('mail_outbox', {
  id: serial('id').primaryKey(),
  to: text('to').notNull(),
  subject: text('subject').notNull(),
  text: text('text').notNull(),
  attachmentSha256: text('attachment_sha256'),
  attachmentName: text('attachment_name'),
  tries: integer('tries').notNull().default(0),
  lastError: text('last_error'),
  /** Leased by the process sending it until then; another takes it only after. */
  claimedUntil: timestamp('claimed_until', { withTimezone: true }),
  sentAt: timestamp('sent_at', { withTimezone: true }),
  createdAt: createdAt(),
})

/** The team withdraws a submitted claim before the officials decide, with its reason. Append-only. */
export const withdrawals = pgTable('withdrawals', {
  id: serial('id').primaryKey(),
  dossierId: integer('dossier_id')
    .notNull()
    .references(() => dossiers.id)
    .unique(),
  reason: text('reason').notNull(),
  withdrawnBy: integer('withdrawn_by')
    .notNull()
    .references(() => users.id),
  withdrawnAt: timestamp('withdrawn_at', { withTimezone: true }).notNull().defaultNow(),
})

export type User = typeof users.$inferSelect
export type Event = typeof events.$inferSelect
export type Membership = typeof memberships.$inferSelect
export type { EventRole }

/**
 * The stewards' signed decision to set aside a failing finding of an attempt (a disagreement between the timing
 * systems), with a written reason: proposed and signed by one appointed steward, signed by others (signatures of
 * kind set-aside on it) until the profile's quorum. Append-only; the dossier prints it beside the finding.
 */
export const setAsides = pgTable('set_asides', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id')
    .notNull()
    .references(() => events.id),
  attemptId: integer('attempt_id')
    .notNull()
    .references(() => attempts.id),
  /** The run whose finding it is; null for a finding of the pair or the attempt. */
  runId: integer('run_id').references(() => runs.id),
  code: text('code').notNull(),
  /** The finding's words when it was set aside. */
  finding: text('finding').notNull(),
  reason: text('reason').notNull(),
  officialId: integer('official_id')
    .notNull()
    .references(() => users.id),
  signatureId: integer('signature_id').references(() => signatures.id),
  createdAt: createdAt(),
})

/**
 * A ratification revoked, with reasons, signed by the holder of the function the profile names: the claim is open
 * again (a new version may be built and decided); the decision and its revocation both stay. Never edited.
 */
export const claimRevocations = pgTable('claim_revocations', {
  id: serial('id').primaryKey(),
  dossierId: integer('dossier_id')
    .notNull()
    .references(() => dossiers.id)
    .unique(),
  reason: text('reason').notNull(),
  revokedBy: integer('revoked_by')
    .notNull()
    .references(() => users.id),
  signatureId: integer('signature_id').references(() => signatures.id),
  createdAt: createdAt(),
})

/** The machine's check-in at the impound after a qualifying run, as the club procedure asks. */
export const impoundCheckIns = pgTable('impound_check_ins', {
  id: serial('id').primaryKey(),
  attemptId: integer('attempt_id')
    .notNull()
    .references(() => attempts.id)
    .unique(),
  checkedInAt: timestamp('checked_in_at', { withTimezone: true }).notNull(),
  note: text('note').notNull().default(''),
  recordedBy: integer('recorded_by')
    .notNull()
    .references(() => users.id),
  createdAt: createdAt(),
})

/** Rate-limit counters of rate-limiter-flexible's PostgreSQL store (its own columns and types). */
export const rateLimits = pgTable('rate_limits', {
  key: varchar('key', { length: 255 }).primaryKey(),
  points: integer('points').notNull().default(0),
  expire: bigint('expire', { mode: 'number' }),
})

/**
 * A scrutineer's signed suspension of a machine after an incident or a modification: it stops the
 * machine's runs until an inspection signed after it clears the machine again. Append-only.
 */
export const machineSuspensions = pgTable('machine_suspensions', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id')
    .notNull()
    .references(() => events.id),
  machineId: integer('machine_id')
    .notNull()
    .references(() => machines.id),
  reason: text('reason').notNull(),
  scrutineerId: integer('scrutineer_id')
    .notNull()
    .references(() => users.id),
  signatureId: integer('signature_id').references(() => signatures.id),
  createdAt: createdAt(),
})

/** The machine checked again after a record run, where the profile asks for it: mass re-measured, signed. */
export const postRunChecks = pgTable('post_run_checks', {
  id: serial('id').primaryKey(),
  attemptId: integer('attempt_id')
    .notNull()
    .references(() => attempts.id)
    .unique(),
  massKg: numeric('mass_kg', { precision: 8, scale: 1 }),
  /** Where the class goes by capacity: the engine's swept volume re-measured (cm³); null where not asked. */
  capacityCm3: numeric('capacity_cm3', { precision: 8, scale: 2 }),
  /** The impound seals' numbers as found after the run; empty where none were recorded. */
  sealNumbers: text('seal_numbers').array().notNull().default(sql`'{}'::text[]`),
  /** Whether every seal was found intact; null where no seal was recorded. */
  sealsIntact: boolean('seals_intact'),
  note: text('note').notNull().default(''),
  scrutineerId: integer('scrutineer_id')
    .notNull()
    .references(() => users.id),
  signatureId: integer('signature_id').references(() => signatures.id),
  createdAt: createdAt(),
}, t => [check('post_run_checks_seals_said', sql`(cardinality(${t.sealNumbers}) = 0) = (${t.sealsIntact} IS NULL)`)])

/**
 * The sanctioning body's homologation of a ratified record, entered and signed by an official: the
 * body's reference and date. Once per dossier; immutable once signed (trigger).
 */
export const homologations = pgTable('homologations', {
  id: serial('id').primaryKey(),
  dossierId: integer('dossier_id')
    .notNull()
    .references(() => dossiers.id)
    .unique(),
  reference: text('reference').notNull(),
  homologatedOn: date('homologated_on', { mode: 'string' }).notNull(),
  officialId: integer('official_id')
    .notNull()
    .references(() => users.id),
  signatureId: integer('signature_id').references(() => signatures.id),
  createdAt: createdAt(),
})

/**
 * A write sent with an Idempotency-Key (a device that queued it while offline, and may send it again):
 * the first request claims the key, its answer is kept, and every later one with the same key gets that
 * answer without writing again.
 */
export const idempotentRequests = pgTable(
  'idempotent_requests',
  {
    userId: integer('user_id')
      .notNull()
      .references(() => users.id),
    key: text('key').notNull(),
    /** Method and path: a key names one request only. */
    request: text('request').notNull(),
    /** Null while the first request is still at work. */
    status: integer('status'),
    body: jsonb('body'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  t => [primaryKey({ columns: [t.userId, t.key] })],
)

/** The event's fees, in its currency, as integer minor units (cents): never floats. */
export const eventFees = pgTable('event_fees', {
  eventId: integer('event_id')
    .primaryKey()
    .references(() => events.id),
  /** ISO 4217, lower case as the payment provider writes it ("eur", "usd"). */
  currency: text('currency').notNull(),
  entryMinor: integer('entry_minor').notNull(),
  /** The record application fee, per claim, passed on to the sanctioning body; 0 for none. */
  recordMinor: integer('record_minor').notNull().default(0),
  /** A late entry (made after `lateAfter`) pays this instead of the entry fee; null for no late fee. */
  lateMinor: integer('late_minor'),
  lateAfter: date('late_after'),
  /** An unpaid entry may not start a run. */
  requirePayment: boolean('require_payment').notNull().default(false),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
})

/** A fee paid (or being paid) through the payment provider's hosted checkout. */
export const payments = pgTable('payments', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id')
    .notNull()
    .references(() => events.id),
  entryId: integer('entry_id')
    .notNull()
    .references(() => entries.id),
  /** What it pays: the entry (or late entry) fee, or the record application fees of its claims. */
  fee: text('fee').$type<'entry' | 'late-entry' | 'record'>().notNull(),
  amountMinor: integer('amount_minor').notNull(),
  currency: text('currency').notNull(),
  status: text('status').$type<'pending' | 'paid' | 'failed' | 'cancelled'>().notNull().default('pending'),
  providerSessionId: text('provider_session_id').notNull().unique(),
  providerPaymentId: text('provider_payment_id'),
  refundedMinor: integer('refunded_minor').notNull().default(0),
  receiptNo: text('receipt_no'),
  createdBy: integer('created_by')
    .notNull()
    .references(() => users.id),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  paidAt: timestamp('paid_at', { withTimezone: true }),
})

/** A refund the organiser asks for, confirmed by the provider's webhook. */
export const refunds = pgTable('refunds', {
  id: serial('id').primaryKey(),
  paymentId: integer('payment_id')
    .notNull()
    .references(() => payments.id),
  amountMinor: integer('amount_minor').notNull(),
  reason: text('reason').notNull(),
  providerRefundId: text('provider_refund_id').notNull().unique(),
  status: text('status').$type<'pending' | 'succeeded' | 'failed'>().notNull().default('pending'),
  createdBy: integer('created_by')
    .notNull()
    .references(() => users.id),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
})

/** Every provider event taken, by its id: a webhook delivered twice changes nothing the second time. */
export const paymentEvents = pgTable('payment_events', {
  id: text('id').primaryKey(),
  type: text('type').notNull(),
  receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
})

/** An official notice on the event's notice board: signed by its issuer, mailed to the teams. */
export const notices = pgTable('notices', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id')
    .notNull()
    .references(() => events.id),
  /** The attempt it concerns (a decision on it); null for the whole event (schedule, course conditions). */
  attemptId: integer('attempt_id').references(() => attempts.id),
  title: text('title').notNull(),
  body: text('body').notNull(),
  issuedBy: integer('issued_by')
    .notNull()
    .references(() => users.id),
  signatureId: integer('signature_id').references(() => signatures.id),
  publishedAt: timestamp('published_at', { withTimezone: true }).notNull().defaultNow(),
})

/** The event's permit from its sanctioning body: who issued it, its number and dates (its document is evidence). */
export const eventPermits = pgTable('event_permits', {
  eventId: integer('event_id')
    .primaryKey()
    .references(() => events.id),
  issuingBody: text('issuing_body').notNull(),
  number: text('number').notNull(),
  validFrom: date('valid_from').notNull(),
  validTo: date('valid_to').notNull(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
})

/** A person appointed to an official function at the event; ended (never deleted) with a reason. */
export const appointments = pgTable('appointments', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id')
    .notNull()
    .references(() => events.id),
  function: text('function').$type<OfficialFunction>().notNull(),
  userId: integer('user_id')
    .notNull()
    .references(() => users.id),
  appointedBy: integer('appointed_by')
    .notNull()
    .references(() => users.id),
  appointedAt: timestamp('appointed_at', { withTimezone: true }).notNull().defaultNow(),
  endedAt: timestamp('ended_at', { withTimezone: true }),
  endReason: text('end_reason'),
})

/**
 * The clerk of the course lets one entry start over named start-line findings (licence, grade, medical, briefing)
 * on one day of the event, with a signed reason. Never edited; the run that started under it names it.
 */
export const startOverrides = pgTable('start_overrides', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id')
    .notNull()
    .references(() => events.id),
  entryId: integer('entry_id')
    .notNull()
    .references(() => entries.id),
  /** The event's local day it holds for. */
  day: date('day').notNull(),
  codes: text('codes').array().notNull(),
  reason: text('reason').notNull(),
  signatureId: integer('signature_id').references(() => signatures.id),
  createdBy: integer('created_by')
    .notNull()
    .references(() => users.id),
  createdAt: createdAt(),
})

/** A riders' (and crews') briefing held by the officials: its time and subject. */
export const briefings = pgTable('briefings', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id')
    .notNull()
    .references(() => events.id),
  title: text('title').notNull(),
  heldAt: timestamp('held_at', { withTimezone: true }).notNull(),
  notes: text('notes').notNull().default(''),
  createdBy: integer('created_by')
    .notNull()
    .references(() => users.id),
  createdAt: createdAt(),
})

/**
 * One attendee's sign-on to a briefing: a rider of an entry, or a person of the event (crew), signed on their
 * own phone or in person on the organiser's device.
 */
export const briefingSignOns = pgTable(
  'briefing_sign_ons',
  {
    id: serial('id').primaryKey(),
    briefingId: integer('briefing_id')
      .notNull()
      .references(() => briefings.id),
    riderId: integer('rider_id').references(() => riders.id),
    userId: integer('user_id').references(() => users.id),
    name: text('name').notNull(),
    onDevice: text('on_device').$type<'own' | 'organiser'>().notNull(),
    signatureId: integer('signature_id').references(() => signatures.id),
    signedAt: timestamp('signed_at', { withTimezone: true }).notNull().defaultNow(),
  },
  t => [
    uniqueIndex('briefing_sign_on_rider').on(t.briefingId, t.riderId).where(sql`rider_id is not null`),
    uniqueIndex('briefing_sign_on_user').on(t.briefingId, t.userId).where(sql`rider_id is null`),
  ],
)

/**
 * A protest lodged by a team against something published about an attempt, or an appeal against the
 * stewards' decision on one (appeal_of). Decided once, with reasons, signed; never edited.
 */
export const protests = pgTable('protests', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id')
    .notNull()
    .references(() => events.id),
  attemptId: integer('attempt_id')
    .notNull()
    .references(() => attempts.id),
  appealOf: integer('appeal_of'),
  kind: text('kind').$type<ProtestKind>().notNull(),
  grounds: text('grounds').notNull(),
  teamId: integer('team_id')
    .notNull()
    .references(() => teams.id),
  lodgedBy: integer('lodged_by')
    .notNull()
    .references(() => users.id),
  lodgedAt: timestamp('lodged_at', { withTimezone: true }).notNull(),
  /** When what is protested was published, and the deadline it gave, as computed at lodging. */
  publishedAt: timestamp('published_at', { withTimezone: true }).notNull(),
  deadline: timestamp('deadline', { withTimezone: true }).notNull(),
  /** The fee the profile sets, as noted (not collected here). */
  feeNote: text('fee_note'),
  signatureId: integer('signature_id').references(() => signatures.id),
  /** The hearing and the decision, set once by the signed decision. */
  heardAt: timestamp('heard_at', { withTimezone: true }),
  present: text('present'),
  hearing: text('hearing'),
  outcome: text('outcome').$type<ProtestOutcome>(),
  reasons: text('reasons'),
  decidedBy: integer('decided_by').references(() => users.id),
  decidedAt: timestamp('decided_at', { withTimezone: true }),
  decisionSignatureId: integer('decision_signature_id').references(() => signatures.id),
  /** What the upheld decision makes void: nothing, the attempt's result, or the run named. */
  voids: text('voids').$type<ProtestVoids>(),
  voidRunId: integer('void_run_id').references(() => runs.id),
})

/** An attempt plan saved by a team, for one of its machines where it names one: private to the team. */
export const plans = pgTable('plans', {
  id: serial('id').primaryKey(),
  teamId: integer('team_id')
    .notNull()
    .references(() => teams.id),
  machineId: integer('machine_id').references(() => machines.id),
  name: text('name').notNull(),
  input: jsonb('input').$type<PlanRequest>().notNull(),
  createdBy: integer('created_by')
    .notNull()
    .references(() => users.id),
  createdAt: createdAt(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
})
