// The account building blocks on their own: the sign-in limiter's arithmetic and its atomic charge on
// a fresh SQLite file, sealed mail links, and server-side sessions. The cipher is checked against
// Node's own AES-256-GCM (an authenticated cipher: NIST SP 800-38D), not against a copy of our code.
import { afterEach, describe, expect, it } from 'vitest'
import { people } from '../../server/db/schema'
import {
  ACCOUNT_FREE_FAILURES, ACCOUNT_MAX_DELAY_MS, ADDRESS_MAX_FAILURES, ADDRESS_WINDOW_MS,
  accountDelayMs, chargeSignInAttempt, refundSignInAttempt
} from '../../server/services/sign-in-limits'
import { LINK_PLACEHOLDER, openMailLink, revealMailLink, sealMailLink } from '../../server/services/mail-links'
import { endPersonSessions, endSession, isLiveSession, openPersonSession, SESSION_MAX_AGE_MS } from '../../server/services/sessions'
import { fixedClock, setClock } from '../../server/core/time/clock'
import { createTestDatabase, removeTestDatabases } from '../support/test-database'

const SECRET = 'unit-test-secret-that-is-long-enough-0123456789'
const T0 = Date.parse('2027-01-15T08:00:00Z')

afterEach(() => {
  removeTestDatabases()
  setClock()
})

describe('sign-in delays per account', () => {
  it('costs nothing for the first five failures, then doubles from one second up to fifteen minutes', () => {
    expect([0, 1, 4].map(accountDelayMs)).toEqual([0, 0, 0])
    expect([5, 6, 7, 8].map(accountDelayMs)).toEqual([1_000, 2_000, 4_000, 8_000])
    expect(accountDelayMs(14)).toBe(512_000)
    // 2^10 s = 1,024 s is past the cap
    expect(accountDelayMs(15)).toBe(ACCOUNT_MAX_DELAY_MS)
    expect(accountDelayMs(500)).toBe(15 * 60_000)
  })

  it('charges each attempt before it is checked, so a burst cannot all read the same count', () => {
    const db = createTestDatabase()
    const verdicts = Array.from({ length: 12 }, () => chargeSignInAttempt(db, 'crew@northwake.test', '10.0.0.1', T0))
    expect(verdicts.filter(v => v.allowed)).toHaveLength(ACCOUNT_FREE_FAILURES)
    const held = verdicts.find(v => !v.allowed)
    expect(held).toMatchObject({ allowed: false, reason: 'account', retryAfterMs: 1_000 })
    // one second later one more attempt may be checked, then two seconds must pass
    expect(chargeSignInAttempt(db, 'crew@northwake.test', '10.0.0.1', T0 + 1_000).allowed).toBe(true)
    expect(chargeSignInAttempt(db, 'crew@northwake.test', '10.0.0.1', T0 + 2_500)).toMatchObject({ allowed: false, retryAfterMs: 500 })
  })

  it('gives the charge back on a right password: the account starts afresh', () => {
    const db = createTestDatabase()
    for (let i = 0; i < 4; i++) chargeSignInAttempt(db, 'liv@northwake.test', '10.0.0.2', T0)
    const right = chargeSignInAttempt(db, 'liv@northwake.test', '10.0.0.2', T0)
    if (!right.allowed) throw new Error('expected the fifth attempt to be checked')
    refundSignInAttempt(db, right.charge)
    const again = Array.from({ length: ACCOUNT_FREE_FAILURES }, () => chargeSignInAttempt(db, 'liv@northwake.test', '10.0.0.2', T0))
    expect(again.every(v => v.allowed)).toBe(true)
  })

  it('limits one client address across many accounts, and forgets it after the window', () => {
    const db = createTestDatabase()
    const verdicts = Array.from({ length: ADDRESS_MAX_FAILURES + 5 }, (_, i) => chargeSignInAttempt(db, `person${i}@northwake.test`, '10.0.0.3', T0))
    expect(verdicts.filter(v => v.allowed)).toHaveLength(ADDRESS_MAX_FAILURES)
    expect(verdicts.at(-1)).toMatchObject({ allowed: false, reason: 'address' })
    expect(chargeSignInAttempt(db, 'someone@northwake.test', '10.0.0.4', T0).allowed).toBe(true)
    expect(chargeSignInAttempt(db, 'someone.else@northwake.test', '10.0.0.3', T0 + ADDRESS_WINDOW_MS + 1).allowed).toBe(true)
  })
})

describe('sealed mail links', () => {
  it('opens what it sealed with the same secret, and refuses another secret or an altered seal', () => {
    const link = 'https://plan.northwake.test/reset?token=abc_DEF-123'
    const sealed = sealMailLink(link, SECRET)
    expect(sealed).not.toContain('abc_DEF')
    expect(openMailLink(sealed, SECRET)).toBe(link)
    expect(sealMailLink(link, SECRET)).not.toBe(sealed)
    expect(() => openMailLink(sealed, `${SECRET}-other`)).toThrow()
    const raw = Buffer.from(sealed, 'base64url')
    raw.writeUInt8(raw.readUInt8(raw.length - 1) ^ 1, raw.length - 1)
    expect(() => openMailLink(raw.toString('base64url'), SECRET)).toThrow()
  })

  it('puts the link into the body only when sending, escaped for HTML', () => {
    const link = 'https://plan.northwake.test/welcome?token=x&y'
    const message = { html: `<a href="${LINK_PLACEHOLDER}">${LINK_PLACEHOLDER}</a>`, text: `Open ${LINK_PLACEHOLDER}`, meta: { sealedLink: sealMailLink(link, SECRET) } }
    const sent = revealMailLink(message, SECRET)
    expect(sent.text).toBe(`Open ${link}`)
    expect(sent.html).toBe('<a href="https://plan.northwake.test/welcome?token=x&amp;y">https://plan.northwake.test/welcome?token=x&amp;y</a>')
    expect(revealMailLink({ html: 'a', text: 'b', meta: null }, SECRET)).toEqual({ html: 'a', text: 'b' })
  })
})

describe('server-side sessions', () => {
  it('honours a session until it is ended, and only for its own person', () => {
    setClock(fixedClock(T0))
    const db = createTestDatabase()
    const [a, b] = db.insert(people).values([{ name: 'Ada Test', email: 'ada@northwake.test', role: 'crew' }, { name: 'Bo Test', email: 'bo@northwake.test', role: 'crew' }]).returning().all()
    const first = openPersonSession(db, a!.id)
    const second = openPersonSession(db, a!.id)
    expect(isLiveSession(db, a!.id, first)).toBe(true)
    expect(isLiveSession(db, b!.id, first)).toBe(false)
    endSession(db, first)
    expect(isLiveSession(db, a!.id, first)).toBe(false)
    expect(isLiveSession(db, a!.id, second)).toBe(true)
    const third = openPersonSession(db, a!.id)
    expect(endPersonSessions(db, a!.id, third)).toBe(1)
    expect(isLiveSession(db, a!.id, second)).toBe(false)
    expect(isLiveSession(db, a!.id, third)).toBe(true)
    setClock(fixedClock(T0 + SESSION_MAX_AGE_MS + 1))
    expect(isLiveSession(db, a!.id, third)).toBe(false)
  })
})
