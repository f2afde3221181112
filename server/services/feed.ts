// A person's private calendar feed (iCalendar, RFC 5545, written by server/core/calendar/ical-writer.ts): their shifts with
// site, light state and review, and optionally the sunrise and sunset at their sites.
//
// The feed URL carries a token. GET /api/me/feed must be able to show the URL again, but only a hash
// of the token is stored (people.feedTokenHash), so the token cannot be read back from the database.
// We therefore never store the token at all: it is derived on demand as
//   HMAC-SHA256(server secret, 'gloamline-feed:' + personId + ':' + salt)
// where the salt is a random value per person kept in `settings` (feed-salt:<personId>). The server
// secret is the session password (NUXT_SESSION_PASSWORD), which never reaches the database, so a
// copy of the database alone reveals no feed URL. Regenerating draws a new salt, which changes the
// token and its stored hash: the old URL answers 404 from then on. Changing the session password
// changes every token too (people then fetch their new URL from settings).
// Explicit imports only, so unit tests can run it.
import { createHash, createHmac, randomBytes } from 'node:crypto'
import { eq } from 'drizzle-orm'
import { ICalEventStatus, ICalEventTransparency } from 'ical-generator'
import { createICalCalendar, type ICalCalendar } from '../core/calendar/ical-writer'
import { people, settings, sites, type Person, type Shift, type Site } from '../db/schema'
import { addDays } from '../../shared/format'
import { REVIEW_STATE_WORDS } from '../../shared/review'
import { localDateOf } from '../core/time/zone-table'
import type { AppDatabase } from '../utils/db'
import { useServerConfig } from '../utils/config'
import { describeCrewShift } from './crew-day'
import { computeLightDaysMs } from '../core/light/index'
import { createSiteBandCutter, loadFeedShifts } from './feed-rows'
import { nowDate, nowMs as clockNowMs } from '../core/time/clock'

const DAY_MS = 86_400_000
// shifts from this far back stay in the feed, so a calendar still shows last month's work
const FEED_PAST_MS = 60 * DAY_MS
const FEED_FUTURE_MS = 2 * 366 * DAY_MS
const FEED_SUN_DAYS = 14
const TOKEN_RE = /^[A-Za-z0-9_-]{43}$/

function saltKey(personId: number) {
  return `feed-salt:${personId}`
}

/** The feed token of a person for a salt: base64url of an HMAC-SHA256 under the server secret (43 characters). */
export function deriveFeedToken(secret: string, personId: number, salt: string): string {
  return createHmac('sha256', secret).update(`gloamline-feed:${personId}:${salt}`).digest('base64url')
}

/** What is stored of a token: its SHA-256, hex. */
export function hashFeedToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}

function readFeedSalt(db: AppDatabase, personId: number): string | null {
  const row = db.select().from(settings).where(eq(settings.key, saltKey(personId))).get()
  const value = row?.value as { salt?: unknown } | undefined
  return typeof value?.salt === 'string' ? value.salt : null
}

function storeFeedSalt(db: AppDatabase, personId: number, secret: string): string {
  const salt = randomBytes(16).toString('hex')
  const token = deriveFeedToken(secret, personId, salt)
  db.transaction((tx) => {
    tx.insert(settings).values({ key: saltKey(personId), value: { salt, createdAt: nowDate().toISOString() } })
      .onConflictDoUpdate({ target: settings.key, set: { value: { salt, createdAt: nowDate().toISOString() } } }).run()
    tx.update(people).set({ feedTokenHash: hashFeedToken(token), updatedAt: nowDate() }).where(eq(people.id, personId)).run()
  })
  return token
}

/** The person's current feed token, created on first use (and its hash stored). */
export function issueFeedToken(db: AppDatabase, personId: number, secret: string): string {
  const salt = readFeedSalt(db, personId)
  if (!salt) return storeFeedSalt(db, personId, secret)
  const token = deriveFeedToken(secret, personId, salt)
  const hash = hashFeedToken(token)
  // the secret changed since the hash was stored: the stored hash follows the token people are shown
  const person = db.select({ hash: people.feedTokenHash }).from(people).where(eq(people.id, personId)).get()
  if (person && person.hash !== hash) db.update(people).set({ feedTokenHash: hash, updatedAt: nowDate() }).where(eq(people.id, personId)).run()
  return token
}

/** Draws a new salt: a new token, and the old URL stops working. */
export function rotateFeedToken(db: AppDatabase, personId: number, secret: string): string {
  return storeFeedSalt(db, personId, secret)
}

/** The active person a feed token belongs to, or undefined (malformed, unknown, revoked or inactive). */
export function findPersonByFeedToken(db: AppDatabase, token: string): Person | undefined {
  if (!TOKEN_RE.test(token)) return undefined
  const person = db.select().from(people).where(eq(people.feedTokenHash, hashFeedToken(token))).get()
  return person?.active ? person : undefined
}

function shortLightState(shift: ReturnType<typeof describeCrewShift>): string {
  if (shift.requirement === 'any') return shift.bandMinutes.dark > 0 ? 'lit work area, partly in the dark' : 'lit work area'
  return shift.minutesBelow >= 1 ? `${shift.lightState.replace('Short of its light need for ', '')} below its light need` : 'in the light it needs'
}

function describeFeedShift(shift: ReturnType<typeof describeCrewShift>, siteName: string): string {
  return [
    `${siteName}: ${shift.span}`,
    `Light: ${shift.requirementWords}. ${shift.lightState}.`,
    `Minutes below its light need: ${shift.minutesBelow}`,
    `In the shift: ${shift.profileText}`,
    `Safety review: ${shift.reviewWords}`,
    ...shift.reviewReasons.map(r => `Review reason: ${r}`),
    ...(shift.mitigations.length ? ['Measures set in the review:', ...shift.mitigations.map(m => `- ${m}`)] : []),
    ...(shift.reviewNote ? [`Review note: ${shift.reviewNote}`] : []),
    `With: ${shift.crewmates.length ? shift.crewmates.join(', ') : 'nobody else'}`,
    ...(shift.notes ? [`Notes: ${shift.notes}`] : []),
    ...shift.cautions.map(c => `Caution: ${c.title}${c.figure ? ` (${c.figure})` : ''}`),
    '',
    'Planning figures from the sun\'s position only; local rules, your employer\'s procedures and your supervisor decide.'
  ].join('\n')
}

const NO_FORECAST = { state: 'none' as const, latest: null, lastAttempt: null }

/**
 * The event status tells the truth about the review (docs/api.md): TENTATIVE while a decision is awaited
 * or the shift was sent back, CANCELLED when cancelled or rejected, CONFIRMED otherwise.
 */
export function feedStatusOf(row: Pick<Shift, 'reviewState' | 'cancelledAt'>): ICalEventStatus {
  if (row.cancelledAt || row.reviewState === 'rejected') return ICalEventStatus.CANCELLED
  if (row.reviewState === 'pending' || row.reviewState === 'changes-requested') return ICalEventStatus.TENTATIVE
  return ICalEventStatus.CONFIRMED
}

// The state word in the event title, the same word as on every screen; nothing when no review is needed.
function feedStateSuffix(row: Pick<Shift, 'reviewState' | 'cancelledAt'>): string {
  if (row.cancelledAt) return ' · Cancelled'
  return row.reviewState === 'not-needed' ? '' : ` · ${REVIEW_STATE_WORDS[row.reviewState]}`
}

// Work of one rendering slice before the feed lets other requests run (renderPersonFeed).
const FEED_SLICE_MS = 25
const FEED_PAGE_MS = 90 * DAY_MS

// Writes the shift events, yielding after each slice of about FEED_SLICE_MS of work. Cancelled shifts
// stay in the feed as CANCELLED, so a calendar that already holds them drops them.
function* addShiftEvents(db: AppDatabase, calendar: ICalCalendar, person: Person, nowMs: number, siteById: Map<number, Site>, homeUrl: string | null, live: Shift[]): Generator<void> {
  // one statement for the shifts, their people and their latest decisions; one light trace per site
  // read in pages of 90 days of starts, with other requests let in between. A shift moved by a write
  // between two pages may be seen twice (kept once) or not at all in this render; the write changes
  // the data stamp, so the next fetch renders afresh (services/feed-cache.ts).
  const fromMs = nowMs - FEED_PAST_MS
  const toMs = nowMs + FEED_FUTURE_MS
  const feedRows: ReturnType<typeof loadFeedShifts> = []
  let sliceStart = performance.now()
  for (let pageMs = fromMs - FEED_PAGE_MS; pageMs < toMs; pageMs += FEED_PAGE_MS) {
    feedRows.push(...loadFeedShifts(db, person.id, fromMs, toMs, { includeCancelled: true, startFrom: pageMs, startTo: pageMs + FEED_PAGE_MS }))
    if (performance.now() - sliceStart > FEED_SLICE_MS) {
      yield
      sliceStart = performance.now()
    }
  }
  const light = createSiteBandCutter(siteById, feedRows)
  const seen = new Set<number>()
  for (const { row, assignees, review } of feedRows) {
    if (seen.has(row.id)) continue
    seen.add(row.id)
    if (row.cancelledAt === null) live.push(row)
    const site = siteById.get(row.siteId)!
    const zone = person.displayZone === 'site' ? site.timezone : person.displayZone
    const bands = light.cut(site.id, row.startAt.getTime(), row.endAt.getTime())
    // the feed is read long after it is fetched: no weather in it, only the light and the review
    const shift = describeCrewShift({ row, site, zone, personId: person.id, assignees, review, forecast: NO_FORECAST, observations: [], bands })
    calendar.createEvent({
      id: `shift-${row.id}@gloamline`,
      sequence: row.version,
      stamp: row.updatedAt,
      created: row.createdAt,
      lastModified: row.updatedAt,
      start: row.startAt,
      end: row.endAt,
      summary: `${row.title} · ${site.name} · ${shortLightState(shift)}${feedStateSuffix(row)}`,
      description: describeFeedShift(shift, site.name),
      location: { title: site.name, geo: { lat: site.latitude, lon: site.longitude } },
      status: feedStatusOf(row),
      url: homeUrl
    })
    if (performance.now() - sliceStart > FEED_SLICE_MS) {
      yield
      sliceStart = performance.now()
    }
  }
}

function addSunEvents(calendar: ICalCalendar, site: Site, nowMs: number) {
  const from = localDateOf(nowMs, site.timezone)
  const days = computeLightDaysMs({ latitude: site.latitude, longitude: site.longitude, timezone: site.timezone, from, to: addDays(from, FEED_SUN_DAYS - 1) })
  const geo = { title: site.name, geo: { lat: site.latitude, lon: site.longitude } }
  for (const day of days) {
    if (day.status !== 'rises-and-sets') {
      const words = day.status === 'polar-night' ? 'Polar night: no sunrise' : 'Midnight sun: no sunset'
      calendar.createEvent({ id: `sun-${site.id}-${day.date}-${day.status}@gloamline`, start: day.date, allDay: true, summary: `${words} at ${site.name}`, location: geo, transparency: ICalEventTransparency.TRANSPARENT })
    }
    day.events.filter(e => e.type === 'sunrise' || e.type === 'sunset').forEach((e, n) => {
      calendar.createEvent({
        id: `sun-${site.id}-${day.date}-${e.type}-${n}@gloamline`,
        start: new Date(e.atMs),
        summary: `${e.type === 'sunrise' ? 'Sunrise' : 'Sunset'} at ${site.name}`,
        location: geo,
        transparency: ICalEventTransparency.TRANSPARENT
      })
    })
  }
}

// The feed in slices: each `yield` is a point where other requests may run.
function* writePersonFeed(db: AppDatabase, person: Person, nowMs: number, homeUrl: string | null, out: { text: string }): Generator<void> {
  const calendar = createICalCalendar({
    name: `Gloamline shifts: ${person.name}`,
    prodId: { company: 'Gloamline', product: 'Shift feed', language: 'EN' },
    ttl: 3600,
    stampMs: nowMs
  })
  const siteById = new Map(db.select().from(sites).all().map(s => [s.id, s]))
  const rows: Shift[] = []
  yield* addShiftEvents(db, calendar, person, nowMs, siteById, homeUrl, rows)
  if (person.feedIncludeSun) {
    const horizon = nowMs + FEED_SUN_DAYS * DAY_MS
    const sunSites = [...new Set(rows.filter(r => r.endAt.getTime() > nowMs && r.startAt.getTime() < horizon).map(r => r.siteId))]
    for (const id of sunSites) addSunEvents(calendar, siteById.get(id)!, nowMs)
  }
  out.text = calendar.toString()
}

/** The person's feed as iCalendar text: shifts in UTC, and sunrise/sunset for 14 days when they asked for it. */
export function buildPersonFeed(db: AppDatabase, person: Person, options: { nowMs?: number, homeUrl?: string | null } = {}): string {
  const out = { text: '' }
  for (const _ of writePersonFeed(db, person, options.nowMs ?? clockNowMs(), options.homeUrl ?? null, out)) { /* all at once */ }
  return out.text
}

/**
 * The same feed, rendered in slices of about 40 ms with other requests let in between (a feed of
 * 10,000 shifts takes a second or more, which must not stall the server). The database is read in
 * the first slice, so the feed is one consistent snapshot.
 */
export async function renderPersonFeed(db: AppDatabase, person: Person, options: { nowMs?: number, homeUrl?: string | null } = {}): Promise<string> {
  const out = { text: '' }
  for (const _ of writePersonFeed(db, person, options.nowMs ?? clockNowMs(), options.homeUrl ?? null, out)) {
    await new Promise(resolve => setImmediate(resolve))
  }
  return out.text
}

/** The server secret feed tokens are derived from: the session password (never stored in the database). */
export function readFeedSecret(): string {
  const secret = useServerConfig().sessionPassword
  if (!secret || secret.length < 32) throw new Error('NUXT_SESSION_PASSWORD is not set: feed tokens cannot be derived')
  return secret
}
