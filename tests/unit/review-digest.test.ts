// Safety mail as a digest: one review-needed mail per officer per run, listing every waiting shift
// that no earlier digest of theirs listed, each with its reasons in words and a link to its review
// page. A fresh database with invented people, a site and shifts.
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import { eq } from 'drizzle-orm'
import type { AppDatabase } from '../../server/utils/db'
import { messages, people, reviews, shifts, sites } from '../../server/db/schema'
import { queueReviewDigests, REVIEW_DIGEST_KIND } from '../../server/services/notice-mail'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'

const NOW = Date.parse('2027-01-05T12:00:00Z')
const BASE = 'https://field.example.test'
let db: AppDatabase
let siteId: number
let officers: number[]

function waitingShift(title: string, day: number) {
  const start = Date.parse('2027-01-10T08:00:00Z') + day * 86_400_000
  return db.insert(shifts).values({
    siteId, title, startAt: new Date(start), endAt: new Date(start + 14 * 3_600_000), light: 'any', reviewState: 'pending',
    reviewReasons: [{ reason: 'long', minutes: 840, maxMinutes: 720 }]
  }).returning().get()
}

function digestsOf(personId: number) {
  return db.select().from(messages).where(eq(messages.personId, personId)).all().filter(m => m.kind === REVIEW_DIGEST_KIND)
}

beforeEach(() => {
  db = createTestDatabase('gloamline-digest-')
  siteId = db.insert(sites).values({ name: 'Invented Digest Yard', latitude: 69.65, longitude: 18.96, timezone: 'Europe/Oslo' }).returning().get().id
  officers = db.insert(people).values([
    { name: 'Officer One', email: 'one@digest.example.test', role: 'safety' },
    { name: 'Officer Two', email: 'two@digest.example.test', role: 'safety' },
    { name: 'Former Officer', email: 'gone@digest.example.test', role: 'safety', active: false },
    { name: 'A Coordinator', email: 'coord@digest.example.test', role: 'coordinator' }
  ]).returning().all().slice(0, 3).map(p => p.id)
})
afterEach(() => {
  db.$client.close()
  removeTestDatabases()
})

describe('the review digest', () => {
  it('sends each active officer one mail listing every waiting shift, with reasons and links', () => {
    const a = waitingShift('Fuel haul', 0)
    const b = waitingShift('Mast repair', 1)
    const ids = queueReviewDigests(db, { baseUrl: BASE, nowMs: NOW })
    expect(ids).toHaveLength(2)
    for (const officer of officers.slice(0, 2)) {
      const [mail] = digestsOf(officer)
      expect(digestsOf(officer)).toHaveLength(1)
      expect(mail!.subject).toBe('Review needed: 2 shifts')
      expect(mail!.text).toContain('Long shift: 14 h, over the 12 h maximum')
      expect(mail!.text).toContain(`${BASE}/review/${a.id}`)
      expect(mail!.text).toContain(`${BASE}/review/${b.id}`)
    }
    expect(digestsOf(officers[2]!)).toHaveLength(0)
  })

  it('sends nothing on a run with nothing new, and only the new shift on the next', () => {
    waitingShift('Fuel haul', 0)
    queueReviewDigests(db, { baseUrl: BASE, nowMs: NOW })
    expect(queueReviewDigests(db, { baseUrl: BASE, nowMs: NOW })).toEqual([])
    const c = waitingShift('Cable pull', 2)
    queueReviewDigests(db, { baseUrl: BASE, nowMs: NOW })
    const mails = digestsOf(officers[0]!)
    expect(mails).toHaveLength(2)
    expect(mails[1]!.subject).toMatch(/^Review needed: Cable pull, /)
    expect(mails[1]!.meta).toMatchObject({ shiftIds: [c.id] })
  })

  it('lists a shift again when a change re-opens it after a decision (a new review round)', () => {
    const a = waitingShift('Fuel haul', 0)
    queueReviewDigests(db, { baseUrl: BASE, nowMs: NOW })
    db.insert(reviews).values({ shiftId: a.id, reviewerId: officers[0]!, decision: 'approved', mitigations: ['warmup-breaks'], shiftVersion: 1 }).run()
    // the shift changed and waits again
    queueReviewDigests(db, { baseUrl: BASE, nowMs: NOW })
    const mails = digestsOf(officers[1]!)
    expect(mails).toHaveLength(2)
    expect(mails[1]!.subject).toMatch(/^Back for review: Fuel haul, /)
  })

  it('leaves out shifts that have ended', () => {
    waitingShift('Fuel haul', 0)
    expect(queueReviewDigests(db, { baseUrl: BASE, nowMs: Date.parse('2027-02-01T00:00:00Z') })).toEqual([])
  })
})
