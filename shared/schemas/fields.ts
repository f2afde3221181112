// Field schemas every request schema is built from, shared by the server's handlers and the forms'
// own checks in the browser, so both refuse the same input with the same words. Pure: zod only.
import { z } from 'zod'
import { isValidTimeZone } from '../time-zone'
import { ROLES } from '../roles'
import { LIGHT_REQUIREMENT_KINDS } from '../light'
import { MAX_NAME_LENGTH, MAX_TRAVEL_MINUTES } from './limits'
import { realDateTime } from './calendar'

/** A calendar date YYYY-MM-DD that exists (2026-02-30 is refused). */
// and in the years the light engine answers for (shared/schemas/calendar.ts)
export const LocalDateSchema = realDateTime(z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'expected a date as YYYY-MM-DD'))

/** An IANA time zone name the runtime knows (the one test: shared/time-zone.ts). */
export const TimeZoneSchema = z.string().min(1, 'required').max(64).refine(isValidTimeZone, 'not an IANA time zone name')

/** An ISO 8601 instant with an offset or Z. */
// a '+' offset sent unencoded in a query string arrives as a space: read it back as '+'
export const InstantSchema = z.preprocess(
  value => (typeof value === 'string' ? value.replace(/(T[\d:.]+) (\d{2}:?\d{2})$/, '$1+$2') : value),
  realDateTime(z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,3})?)?(Z|[+-]\d{2}:?\d{2})$/, 'expected an ISO 8601 instant with an offset'))
    .refine(value => !Number.isNaN(Date.parse(value)), 'not a valid instant'))

/** A finite number in [min, max], given as a number or (from a query string) a non-empty numeric string. */
export function numberBetween(min: number, max: number) {
  return z.union([z.number(), z.string().trim().min(1, 'required')], { error: 'expected a number' })
    .transform(value => Number(value))
    .pipe(z.number({ error: 'expected a number' }).min(min, `must be between ${min} and ${max}`).max(max, `must be between ${min} and ${max}`))
}

export const LatitudeSchema = numberBetween(-90, 90)
export const LongitudeSchema = numberBetween(-180, 180)

export const EmailSchema = z.string().trim().toLowerCase().pipe(z.email('not an e-mail address').max(254))

/**
 * True when text holds a control character (C0, DEL, C1) or a Unicode line or paragraph separator.
 * Names and titles are one line of plain text: a line break in one could forge lines wherever it is
 * written out (a calendar feed, a mail header, a CSV export).
 */
export function hasControlCharacters(value: string): boolean {
  for (const ch of value) {
    const code = ch.codePointAt(0)!
    if (code < 0x20 || (code >= 0x7f && code < 0xa0) || code === 0x2028 || code === 0x2029) return true
  }
  return false
}
export const CONTROL_CHARACTERS_MESSAGE = 'must be one line without control characters'

/** A name or title: trimmed, 1 to `max` characters, one line, no control characters. */
export function singleLineText(max: number) {
  return z.string().trim().min(1, 'required').max(max, `at most ${max} characters`).refine(value => !hasControlCharacters(value), CONTROL_CHARACTERS_MESSAGE)
}

export const PersonNameSchema = singleLineText(MAX_NAME_LENGTH)
export const RoleSchema = z.enum(ROLES, { error: `must be ${ROLES.slice(0, -1).join(', ')} or ${ROLES[ROLES.length - 1]}` })
export const LightRequirementSchema = z.enum(LIGHT_REQUIREMENT_KINDS, { error: `must be ${LIGHT_REQUIREMENT_KINDS.slice(0, -1).join(', ')} or ${LIGHT_REQUIREMENT_KINDS[LIGHT_REQUIREMENT_KINDS.length - 1]}` })

/** Minutes of travel each way, 0 to MAX_TRAVEL_MINUTES. */
export const TravelMinutesSchema = z.number({ error: 'expected minutes of travel each way' }).int('must be whole minutes').min(0, 'must be 0 or more').max(MAX_TRAVEL_MINUTES, `must be at most ${MAX_TRAVEL_MINUTES}`)
