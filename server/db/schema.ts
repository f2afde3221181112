import { sql } from 'drizzle-orm'
import { index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core'
import type { ReviewReasonDetail, ReviewShiftSnapshot } from '../../shared/review'
import { ROLES } from '../../shared/roles'
import { LIGHT_REQUIREMENT_KINDS } from '../../shared/light'

// The enums of roles and light requirements are the shared lists (shared/roles.ts, shared/light.ts).
export { ROLES }
export const LIGHT_REQUIREMENTS = LIGHT_REQUIREMENT_KINDS
export const REVIEW_STATES = ['not-needed', 'pending', 'approved', 'rejected', 'changes-requested'] as const

const createdAt = integer('created_at', { mode: 'timestamp_ms' }).notNull().default(sql`(unixepoch() * 1000)`)
const updatedAt = integer('updated_at', { mode: 'timestamp_ms' }).notNull().default(sql`(unixepoch() * 1000)`)

export const people = sqliteTable('people', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  email: text('email').notNull(),
  name: text('name').notNull(),
  role: text('role', { enum: ROLES }).notNull(),
  passwordHash: text('password_hash'),
  active: integer('active', { mode: 'boolean' }).notNull().default(true),
  remindersEnabled: integer('reminders_enabled', { mode: 'boolean' }).notNull().default(true),
  // 'site' shows times in each site's zone; any IANA name shows them in that zone
  displayZone: text('display_zone').notNull().default('site'),
  // the person's own zone for whole days away; null: their home site's zone, else UTC
  timezone: text('timezone'),
  homeSiteId: integer('home_site_id'),
  // cold and wind figures on screens and in mail: °C, km/h, m or °F, mph, ft
  units: text('units', { enum: ['metric', 'imperial'] }).notNull().default('metric'),
  feedTokenHash: text('feed_token_hash'),
  feedIncludeSun: integer('feed_include_sun', { mode: 'boolean' }).notNull().default(false),
  createdAt,
  updatedAt
}, t => [uniqueIndex('people_email_unique').on(t.email), index('people_feed_token_idx').on(t.feedTokenHash)])

export const sites = sqliteTable('sites', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  name: text('name').notNull(),
  latitude: real('latitude').notNull(),
  longitude: real('longitude').notNull(),
  elevation: real('elevation'),
  timezone: text('timezone').notNull(),
  defaultLight: text('default_light', { enum: LIGHT_REQUIREMENTS }).notNull().default('daylight'),
  // local hour (0–23) at which the evening-before reminders for this site go out
  reminderHour: integer('reminder_hour').notNull().default(18),
  // minutes of travel each way, the default for new shifts at this site
  travelMinutes: integer('travel_minutes').notNull().default(0),
  notes: text('notes').notNull().default(''),
  archivedAt: integer('archived_at', { mode: 'timestamp_ms' }),
  createdAt,
  updatedAt
})

export const crews = sqliteTable('crews', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  name: text('name').notNull(),
  createdAt
}, t => [uniqueIndex('crews_name_unique').on(t.name)])

export const crewMembers = sqliteTable('crew_members', {
  crewId: integer('crew_id').notNull().references(() => crews.id, { onDelete: 'cascade' }),
  personId: integer('person_id').notNull().references(() => people.id, { onDelete: 'cascade' })
}, t => [primaryKey({ columns: [t.crewId, t.personId] })])

export const unavailability = sqliteTable('unavailability', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  personId: integer('person_id').notNull().references(() => people.id, { onDelete: 'cascade' }),
  startAt: integer('start_at', { mode: 'timestamp_ms' }).notNull(),
  endAt: integer('end_at', { mode: 'timestamp_ms' }).notNull(),
  reason: text('reason').notNull().default(''),
  createdAt
}, t => [index('unavailability_person_idx').on(t.personId, t.startAt)])

export const rotations = sqliteTable('rotations', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  siteId: integer('site_id').notNull().references(() => sites.id),
  title: text('title').notNull(),
  light: text('light', { enum: LIGHT_REQUIREMENTS }).notNull(),
  // local dates YYYY-MM-DD, both included; times HH:mm on the site's wall clock
  fromDate: text('from_date').notNull(),
  toDate: text('to_date').notNull(),
  startTime: text('start_time').notNull(),
  endTime: text('end_time').notNull(),
  onDays: integer('on_days').notNull(),
  offDays: integer('off_days').notNull(),
  travelMinutes: integer('travel_minutes'),
  // the people as last planned (each shift keeps its own list)
  assigneeIds: text('assignee_ids', { mode: 'json' }).$type<number[]>().notNull(),
  createdBy: integer('created_by').references(() => people.id),
  createdAt,
  updatedAt
}, t => [index('rotations_site_idx').on(t.siteId, t.fromDate)])

export const shifts = sqliteTable('shifts', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  siteId: integer('site_id').notNull().references(() => sites.id),
  title: text('title').notNull(),
  startAt: integer('start_at', { mode: 'timestamp_ms' }).notNull(),
  endAt: integer('end_at', { mode: 'timestamp_ms' }).notNull(),
  light: text('light', { enum: LIGHT_REQUIREMENTS }).notNull(),
  notes: text('notes').notNull().default(''),
  // minutes of travel each way: the light check covers start − travel to end + travel
  travelMinutes: integer('travel_minutes').notNull().default(0),
  minutesBelow: integer('minutes_below').notNull().default(0),
  flagged: integer('flagged', { mode: 'boolean' }).notNull().default(false),
  reviewState: text('review_state', { enum: REVIEW_STATES }).notNull().default('not-needed'),
  // why the shift needs a safety decision, with the figures behind each reason (shared/review.ts)
  reviewReasons: text('review_reasons', { mode: 'json' }).$type<ReviewReasonDetail[]>().notNull().default(sql`'[]'`),
  // the reason a coordinator gave for keeping a shift despite its conflict warnings
  conflictOverride: text('conflict_override'),
  // optimistic concurrency: every accepted change increments it; a stale copy gets 409
  version: integer('version').notNull().default(1),
  cancelledAt: integer('cancelled_at', { mode: 'timestamp_ms' }),
  createdBy: integer('created_by').references(() => people.id),
  // the rotation this shift was made by, if any; it stays an ordinary shift
  rotationId: integer('rotation_id').references(() => rotations.id),
  createdAt,
  updatedAt
}, t => [index('shifts_rotation_idx').on(t.rotationId, t.startAt), index('shifts_site_time_idx').on(t.siteId, t.startAt), index('shifts_time_idx').on(t.startAt, t.endAt)])

export const shiftAssignees = sqliteTable('shift_assignees', {
  shiftId: integer('shift_id').notNull().references(() => shifts.id, { onDelete: 'cascade' }),
  personId: integer('person_id').notNull().references(() => people.id)
}, t => [primaryKey({ columns: [t.shiftId, t.personId] }), index('shift_assignees_person_idx').on(t.personId)])

export const reviews = sqliteTable('reviews', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  shiftId: integer('shift_id').notNull().references(() => shifts.id, { onDelete: 'cascade' }),
  reviewerId: integer('reviewer_id').notNull().references(() => people.id),
  decision: text('decision', { enum: ['approved', 'rejected', 'changes-requested'] }).notNull(),
  mitigations: text('mitigations', { mode: 'json' }).$type<string[]>().notNull(),
  note: text('note').notNull().default(''),
  // the shift version the decision was made on
  shiftVersion: integer('shift_version').notNull(),
  // what the shift was when decided (times, site, light, people), to show what changed when it re-opens
  snapshot: text('snapshot', { mode: 'json' }).$type<ReviewShiftSnapshot>(),
  createdAt
}, t => [index('reviews_shift_idx').on(t.shiftId)])

export const auditLog = sqliteTable('audit_log', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  actorId: integer('actor_id').references(() => people.id),
  action: text('action').notNull(),
  entity: text('entity').notNull(),
  entityId: integer('entity_id'),
  detail: text('detail', { mode: 'json' }).$type<Record<string, unknown>>(),
  createdAt
}, t => [index('audit_entity_idx').on(t.entity, t.entityId)])

export const loginAttempts = sqliteTable('login_attempts', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  email: text('email').notNull(),
  at: integer('at', { mode: 'timestamp_ms' }).notNull()
}, t => [index('login_attempts_email_idx').on(t.email, t.at)])

export const forecasts = sqliteTable('forecasts', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  source: text('source').notNull(),
  // 'ok' with hours, or why there is no usable forecast ('timeout', 'http-error', 'malformed', 'network')
  status: text('status').notNull().default('ok'),
  fetchedAt: integer('fetched_at', { mode: 'timestamp_ms' }).notNull(),
  hours: text('hours', { mode: 'json' }).$type<{ at: string, temperatureC: number | null, windKmh: number | null, gustKmh: number | null, visibilityM?: number | null }[]>().notNull()
}, t => [index('forecasts_site_idx').on(t.siteId, t.fetchedAt)])

export const observations = sqliteTable('observations', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  siteId: integer('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  at: integer('at', { mode: 'timestamp_ms' }).notNull(),
  temperatureC: real('temperature_c').notNull(),
  windKmh: real('wind_kmh').notNull(),
  visibilityM: real('visibility_m'),
  source: text('source', { enum: ['manual', 'csv'] }).notNull(),
  createdBy: integer('created_by').references(() => people.id),
  createdAt
}, t => [index('observations_site_idx').on(t.siteId, t.at)])

export const messages = sqliteTable('messages', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  // what makes a message unique (kind, person, date, shift set): a second run finds it and sends nothing
  dedupeKey: text('dedupe_key').notNull(),
  kind: text('kind').notNull(),
  personId: integer('person_id').references(() => people.id),
  toEmail: text('to_email').notNull(),
  subject: text('subject').notNull(),
  html: text('html').notNull(),
  text: text('text').notNull(),
  meta: text('meta', { mode: 'json' }).$type<Record<string, unknown>>(),
  status: text('status', { enum: ['queued', 'sent', 'failed'] }).notNull().default('queued'),
  attempts: integer('attempts').notNull().default(0),
  lastError: text('last_error'),
  nextAttemptAt: integer('next_attempt_at', { mode: 'timestamp_ms' }),
  // a sender (any process) holds the message until then: nobody else sends it, not even a forced send
  leaseUntil: integer('lease_until', { mode: 'timestamp_ms' }),
  sentAt: integer('sent_at', { mode: 'timestamp_ms' }),
  createdAt
}, t => [uniqueIndex('messages_dedupe_unique').on(t.dedupeKey), index('messages_status_idx').on(t.status, t.nextAttemptAt)])

export const invitations = sqliteTable('invitations', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  personId: integer('person_id').notNull().references(() => people.id, { onDelete: 'cascade' }),
  tokenHash: text('token_hash').notNull(),
  expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull(),
  usedAt: integer('used_at', { mode: 'timestamp_ms' }),
  // 'invitation' sets a first password (72 h); 'reset' replaces a forgotten one (1 h)
  purpose: text('purpose', { enum: ['invitation', 'reset'] }).notNull().default('invitation'),
  createdBy: integer('created_by').references(() => people.id),
  createdAt
}, t => [uniqueIndex('invitations_token_unique').on(t.tokenHash)])

// A party's time in the field: out (departedAt) until back (returnedAt), one row per departure.
export const fieldOutings = sqliteTable('field_outings', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  shiftId: integer('shift_id').notNull().references(() => shifts.id, { onDelete: 'cascade' }),
  departedAt: integer('departed_at', { mode: 'timestamp_ms' }).notNull(),
  expectedBackAt: integer('expected_back_at', { mode: 'timestamp_ms' }).notNull(),
  departedBy: integer('departed_by').references(() => people.id),
  returnedAt: integer('returned_at', { mode: 'timestamp_ms' }),
  returnedBy: integer('returned_by').references(() => people.id),
  createdAt
}, t => [index('field_outings_shift_idx').on(t.shiftId), index('field_outings_open_idx').on(t.returnedAt, t.expectedBackAt)])

export const fieldCheckIns = sqliteTable('field_check_ins', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  outingId: integer('outing_id').notNull().references(() => fieldOutings.id, { onDelete: 'cascade' }),
  at: integer('at', { mode: 'timestamp_ms' }).notNull(),
  personId: integer('person_id').references(() => people.id),
  note: text('note').notNull().default('')
}, t => [index('field_check_ins_outing_idx').on(t.outingId, t.at)])

// One row per signed-in browser. The sealed cookie carries a random session id; only its SHA-256 is
// stored. A request is honoured only while its row exists and is not ended, so signing out, a new
// password or deactivation stops a copied cookie at once.
export const sessions = sqliteTable('sessions', {
  idHash: text('id_hash').primaryKey(),
  personId: integer('person_id').notNull().references(() => people.id, { onDelete: 'cascade' }),
  createdAt,
  endedAt: integer('ended_at', { mode: 'timestamp_ms' })
}, t => [index('sessions_person_idx').on(t.personId)])

// Failed sign-ins per key ('account:<e-mail>' or 'address:<client address>'), counted atomically.
export const signInLimits = sqliteTable('sign_in_limits', {
  key: text('key').primaryKey(),
  failures: integer('failures').notNull(),
  lastFailureAt: integer('last_failure_at', { mode: 'timestamp_ms' }).notNull()
})

export const settings = sqliteTable('settings', {
  key: text('key').primaryKey(),
  value: text('value', { mode: 'json' }).$type<unknown>().notNull()
})

export type Person = typeof people.$inferSelect
export type NewPerson = typeof people.$inferInsert
export type Site = typeof sites.$inferSelect
export type NewSite = typeof sites.$inferInsert
export type Crew = typeof crews.$inferSelect
export type Rotation = typeof rotations.$inferSelect
export type Shift = typeof shifts.$inferSelect
export type NewShift = typeof shifts.$inferInsert
export type Review = typeof reviews.$inferSelect
export type Message = typeof messages.$inferSelect
