import { sql } from 'drizzle-orm'
import {
  bigserial, boolean, date, index, integer, jsonb, numeric, pgEnum, pgTable, serial, text, timestamp, uniqueIndex,
} from 'drizzle-orm/pg-core'
import type { RuleProfile } from '#shared/rules/profile'

const createdAt = () => timestamp('created_at', { withTimezone: true }).notNull().defaultNow()

export const eventRole = pgEnum('event_role', ['organiser', 'timekeeper', 'scrutineer', 'team', 'official'])
export const tokenPurpose = pgEnum('token_purpose', ['invite', 'reset'])
export const powerSource = pgEnum('power_source', ['electric', 'combustion', 'hybrid'])
export const streamlining = pgEnum('streamlining', ['none', 'partial', 'full'])

export const users = pgTable('users', {
  id: serial('id').primaryKey(),
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  passwordHash: text('password_hash'),
  isAdmin: boolean('is_admin').notNull().default(false),
  createdAt: createdAt(),
  passwordChangedAt: timestamp('password_changed_at', { withTimezone: true }),
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
  createdBy: integer('created_by').references(() => users.id),
  createdAt: createdAt(),
})

export const teams = pgTable('teams', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id').notNull().references(() => events.id),
  name: text('name').notNull(),
  createdAt: createdAt(),
}, t => [uniqueIndex('teams_event_name').on(t.eventId, t.name)])

export const memberships = pgTable('memberships', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id').notNull().references(() => events.id),
  userId: integer('user_id').notNull().references(() => users.id),
  role: eventRole('role').notNull(),
  /** For the team role: the team this person enters for. */
  teamId: integer('team_id').references(() => teams.id),
  invitedBy: integer('invited_by').references(() => users.id),
  createdAt: createdAt(),
}, t => [
  uniqueIndex('memberships_event_user_role').on(t.eventId, t.userId, t.role),
  index('memberships_user').on(t.userId),
])

/** Single-use links for invitations and password resets; only the SHA-256 of the token is kept. */
export const authTokens = pgTable('auth_tokens', {
  id: serial('id').primaryKey(),
  userId: integer('user_id').notNull().references(() => users.id),
  purpose: tokenPurpose('purpose').notNull(),
  tokenHash: text('token_hash').notNull().unique(),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true }),
  createdAt: createdAt(),
})

/** Kept in PostgreSQL so the sign-in limit holds across several app servers. */
export const loginAttempts = pgTable('login_attempts', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  email: text('email').notNull(),
  succeeded: boolean('succeeded').notNull(),
  at: timestamp('at', { withTimezone: true }).notNull().default(sql`now()`),
}, t => [index('login_attempts_email_at').on(t.email, t.at)])

export const courses = pgTable('courses', {
  id: serial('id').primaryKey(),
  eventId: integer('event_id').notNull().references(() => events.id),
  name: text('name').notNull(),
  /** Direction of travel of the "out" runs, degrees from true north. */
  headingDeg: numeric('heading_deg', { precision: 6, scale: 2 }).notNull(),
  surface: text('surface').notNull(),
  createdAt: createdAt(),
})

export const traps = pgTable('traps', {
  id: serial('id').primaryKey(),
  courseId: integer('course_id').notNull().references(() => courses.id),
  label: text('label').notNull(),
  /** Surveyed position, metres from the start line. */
  positionM: numeric('position_m', { precision: 12, scale: 3 }).notNull(),
  elevationM: numeric('elevation_m', { precision: 9, scale: 3 }).notNull(),
}, t => [uniqueIndex('traps_course_label').on(t.courseId, t.label)])

export const machines = pgTable('machines', {
  id: serial('id').primaryKey(),
  teamId: integer('team_id').notNull().references(() => teams.id),
  name: text('name').notNull(),
  power: powerSource('power').notNull(),
  declaredMassKg: numeric('declared_mass_kg', { precision: 8, scale: 1 }).notNull(),
  division: streamlining('division').notNull(),
  createdAt: createdAt(),
})

export const riders = pgTable('riders', {
  id: serial('id').primaryKey(),
  teamId: integer('team_id').notNull().references(() => teams.id),
  name: text('name').notNull(),
  licenceNo: text('licence_no').notNull(),
  licenceExpires: date('licence_expires').notNull(),
  createdAt: createdAt(),
})

export type User = typeof users.$inferSelect
export type Event = typeof events.$inferSelect
export type Membership = typeof memberships.$inferSelect
export type EventRole = (typeof eventRole.enumValues)[number]
