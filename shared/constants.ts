/**
 * Every enumeration of the product, defined once. The database enums (server/database/schema.ts),
 * the zod schemas (shared/schemas/) and the TypeScript types all derive from these lists.
 */

/** What a person does at an event; one person may hold several roles. */
export const EVENT_ROLES = ['organiser', 'timekeeper', 'scrutineer', 'team', 'official'] as const
export type EventRole = (typeof EVENT_ROLES)[number]

/** Why a one-time link was sent. */
export const TOKEN_PURPOSES = ['invite', 'reset'] as const

export const POWER_SOURCES = ['electric', 'combustion', 'hybrid'] as const
export type PowerSource = (typeof POWER_SOURCES)[number]

/** How far a machine's body is streamlined. */
export const STREAMLINING = ['none', 'partial', 'full'] as const
export type Streamlining = (typeof STREAMLINING)[number]

/** A measured distance entered at speed (flying) or from rest (standing). */
export const START_KINDS = ['flying', 'standing'] as const
export type StartKind = (typeof START_KINDS)[number]

export const SYSTEM_ROLES = ['primary', 'backup'] as const
export type SystemRole = (typeof SYSTEM_ROLES)[number]

/**
 * The clock a timing system's times of day are read on: the event's local time, or UTC (a device set to GPS time
 * that shows UTC). Its passings are placed in the day by it.
 */
export const TIME_BASES = ['local', 'utc'] as const
export type TimeBase = (typeof TIME_BASES)[number]

/** A run's direction along the course: out, or back for the return run. */
export const DIRECTIONS = ['out', 'back'] as const
export type Direction = (typeof DIRECTIONS)[number]

export const RUN_STATUSES = ['open', 'finished', 'aborted'] as const
export type RunStatus = (typeof RUN_STATUSES)[number]

/** What a signature row signs. */
export const SIGNED_KINDS = [
  'timing-sheet',
  'timing-sheet-reopened',
  'inspection',
  'statement',
  'ratification',
  'set-aside',
  'suspension',
  'post-run-check',
  'checklist',
  'homologation',
  'notice',
  'start-override',
  'briefing-sign-on',
  'protest',
  'protest-decision',
  'revocation',
  'confirmation',
] as const
export type SignedKind = (typeof SIGNED_KINDS)[number]

/** The units records are published in. */
export const RECORD_UNITS = ['km/h', 'mph'] as const
export type RecordUnit = (typeof RECORD_UNITS)[number]

/** What became of a claim (a submitted dossier): awaiting the officials, decided, or withdrawn by the team. */
export const CLAIM_STATUSES = ['claimed', 'ratified', 'homologated', 'refused', 'withdrawn', 'revoked'] as const
export type ClaimStatus = (typeof CLAIM_STATUSES)[number]

/** The officials' decision on a submitted dossier. */
export const DECISIONS = ['ratified', 'refused'] as const
export type Decision = (typeof DECISIONS)[number]

/** The answer to a checklist item: pass, fail or not applicable. */
export const ITEM_RESULTS = ['pass', 'fail', 'na'] as const
export type ItemResult = (typeof ITEM_RESULTS)[number]

/**
 * The kind of an electric machine's traction bus: DC, AC, or DC and AC buses conductively connected,
 * with or without the additional protection on the AC side that UN ECE Regulation 100, 5.1.3 names.
 */
export const BUS_KINDS = ['dc', 'ac', 'dc-ac', 'dc-ac-protected'] as const
export type BusKind = (typeof BUS_KINDS)[number]

export const EVIDENCE_KINDS = [
  'survey-certificate',
  'calibration-certificate',
  'scale-certificate',
  'rider-licence',
  'photo',
  'video',
  'data-log',
  'other-document',
] as const
export type EvidenceKind = (typeof EVIDENCE_KINDS)[number]

/** How a pair's result is averaged. */
export const AVERAGINGS = ['mean-of-times', 'mean-of-speeds'] as const
export type Averaging = (typeof AVERAGINGS)[number]

/** The day's papers printed from the event: results by class, start list and run order, a run sheet to fill by hand. */
export const PAPER_SHEETS = ['results', 'start-list', 'blank-run-sheet'] as const
export type PaperSheet = (typeof PAPER_SHEETS)[number]

/** The functions officials are appointed to at an event. */
export const OFFICIAL_FUNCTIONS = [
  'clerk-of-course', 'chief-timekeeper', 'chief-scrutineer', 'observer', 'steward',
] as const
export type OfficialFunction = (typeof OFFICIAL_FUNCTIONS)[number]
export const OFFICIAL_FUNCTION_LABELS: Record<OfficialFunction, string> = {
  'clerk-of-course': 'Clerk of the course',
  'chief-timekeeper': 'Chief timekeeper',
  'chief-scrutineer': 'Chief scrutineer',
  'observer': 'Observer of the sanctioning body',
  'steward': 'Steward',
}
