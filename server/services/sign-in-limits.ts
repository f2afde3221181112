// The sign-in limiter. Two counts are kept in the database (so a restart does not reset them):
// failures per account (the e-mail typed, known or not) and failures per client address.
//
// - The count is charged *before* the slow password hash, inside one synchronous transaction, so
//   parallel guesses cannot all read the same count: each one takes its own place in the queue.
//   A correct password then gives the charge back.
// - Per account, the first ACCOUNT_FREE_FAILURES failures cost nothing; after that each further
//   attempt must wait a delay that doubles with every failure, up to ACCOUNT_MAX_DELAY_MS. A stranger
//   can slow an account down but never lock it for good, and the owner can always use a reset link.
// - Per client address, at most ADDRESS_MAX_FAILURES failures in ADDRESS_WINDOW_MS, whichever
//   accounts they were for (many accounts, one guesser).
// - When a failure cannot be recorded (read-only or failing storage), sign-in is refused: the
//   limiter fails closed rather than letting uncounted guesses through.
// Explicit imports only, so unit tests can run it.
import { eq, inArray } from 'drizzle-orm'
import { signInLimits } from '../db/schema'
import type { AppDatabase } from '../utils/db'

export const ACCOUNT_FREE_FAILURES = 5
export const ACCOUNT_BASE_DELAY_MS = 1_000
export const ACCOUNT_MAX_DELAY_MS = 15 * 60_000
// an account's failures are forgotten after a day without any
export const ACCOUNT_FORGET_MS = 24 * 3_600_000
export const ADDRESS_MAX_FAILURES = 30
export const ADDRESS_WINDOW_MS = 15 * 60_000

export interface SignInCharge {
  accountKey: string
  addressKey: string
}

export type SignInVerdict = { allowed: true, charge: SignInCharge } | { allowed: false, retryAfterMs: number, reason: 'account' | 'address' }

/** The wait an account must observe after `failures` failures, the last at `lastMs` (0 while free). */
export function accountDelayMs(failures: number): number {
  if (failures < ACCOUNT_FREE_FAILURES) return 0
  return Math.min(ACCOUNT_BASE_DELAY_MS * 2 ** Math.min(failures - ACCOUNT_FREE_FAILURES, 30), ACCOUNT_MAX_DELAY_MS)
}

function keysFor(email: string, address: string): SignInCharge {
  return { accountKey: `account:${email}`, addressKey: `address:${address}` }
}

/**
 * Decides whether a sign-in attempt may be checked, and if so charges one failure to the account and
 * the address in the same transaction. Throws when storage refuses the write (the caller answers 503).
 */
export function chargeSignInAttempt(db: AppDatabase, email: string, address: string, nowMs: number): SignInVerdict {
  const keys = keysFor(email, address)
  return db.transaction((tx) => {
    const rows = tx.select().from(signInLimits).where(inArray(signInLimits.key, [keys.accountKey, keys.addressKey])).all()
    const account = rows.find(r => r.key === keys.accountKey)
    const addr = rows.find(r => r.key === keys.addressKey)
    const accountFailures = account && nowMs - account.lastFailureAt.getTime() < ACCOUNT_FORGET_MS ? account.failures : 0
    const addressFailures = addr && nowMs - addr.lastFailureAt.getTime() < ADDRESS_WINDOW_MS ? addr.failures : 0
    if (addressFailures >= ADDRESS_MAX_FAILURES) {
      return { allowed: false as const, reason: 'address' as const, retryAfterMs: addr!.lastFailureAt.getTime() + ADDRESS_WINDOW_MS - nowMs }
    }
    const wait = account ? account.lastFailureAt.getTime() + accountDelayMs(accountFailures) - nowMs : 0
    if (accountFailures >= ACCOUNT_FREE_FAILURES && wait > 0) {
      return { allowed: false as const, reason: 'account' as const, retryAfterMs: wait }
    }
    const at = new Date(nowMs)
    for (const [key, failures] of [[keys.accountKey, accountFailures + 1], [keys.addressKey, addressFailures + 1]] as const) {
      tx.insert(signInLimits).values({ key, failures, lastFailureAt: at })
        .onConflictDoUpdate({ target: signInLimits.key, set: { failures, lastFailureAt: at } }).run()
    }
    return { allowed: true as const, charge: keys }
  }, { behavior: 'immediate' })
}

/** A correct password: the account starts afresh and the address gets its charge back. */
export function refundSignInAttempt(db: AppDatabase, charge: SignInCharge) {
  db.transaction((tx) => {
    tx.delete(signInLimits).where(eq(signInLimits.key, charge.accountKey)).run()
    const addr = tx.select().from(signInLimits).where(eq(signInLimits.key, charge.addressKey)).get()
    if (addr && addr.failures > 1) tx.update(signInLimits).set({ failures: addr.failures - 1 }).where(eq(signInLimits.key, charge.addressKey)).run()
    else if (addr) tx.delete(signInLimits).where(eq(signInLimits.key, charge.addressKey)).run()
  })
}

/** A password set through a link or by its owner: the account's delays end. */
export function clearAccountSignInLimit(db: Pick<AppDatabase, 'delete'>, email: string) {
  db.delete(signInLimits).where(eq(signInLimits.key, `account:${email}`)).run()
}
