import { eq } from 'drizzle-orm'
import { z } from 'zod'
import { settings } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { recordAudit } from './audit'
import type { WorkRules } from '../core/planning/conflicts'

// Defaults: 11 h daily rest from EU Working Time Directive 2003/88/EC, art. 3; a 12 h longest shift
// is common practice in field rosters. Both are settings because local law, agreements and the
// employer's procedures decide the real figures.
// reviewWindChillC: −27 is where ECCC's wind chill table starts its high-risk band (exposed skin can
// freeze in 10–30 minutes); work at or below it goes to safety review. The operator sets its own.
// weeklyLimitHours: off unless the operator turns it on (48 h is EU Directive 2003/88/EC art. 6).
export const DEFAULT_WORK_RULES: OperatorWorkRules = { minRestHours: 11, maxShiftHours: 12, reviewWindChillC: -27, weeklyLimitHours: null }
export const REVIEW_WIND_CHILL_RANGE = { min: -80, max: 10 } as const

/** The work rules with the operator's review limit for cold. */
export interface OperatorWorkRules extends WorkRules {
  reviewWindChillC: number
}
export const WORK_RULES_SETTING_KEY = 'work-rules'

const StoredWorkRulesSchema = z.object({
  minRestHours: z.number().min(0).max(24),
  maxShiftHours: z.number().min(1).max(168),
  reviewWindChillC: z.number().min(REVIEW_WIND_CHILL_RANGE.min).max(REVIEW_WIND_CHILL_RANGE.max),
  weeklyLimitHours: z.number().min(1).max(168).nullable()
}).partial()

export const WorkRulesPatchSchema = z.object({
  minRestHours: z.number({ error: 'expected a number of hours' }).min(0, 'must be between 0 and 24').max(24, 'must be between 0 and 24').optional(),
  maxShiftHours: z.number({ error: 'expected a number of hours' }).min(1, 'must be between 1 and 168').max(168, 'must be between 1 and 168').optional(),
  reviewWindChillC: z.number({ error: 'expected a wind chill in °C' })
    .min(REVIEW_WIND_CHILL_RANGE.min, `must be between ${REVIEW_WIND_CHILL_RANGE.min} and ${REVIEW_WIND_CHILL_RANGE.max}`)
    .max(REVIEW_WIND_CHILL_RANGE.max, `must be between ${REVIEW_WIND_CHILL_RANGE.min} and ${REVIEW_WIND_CHILL_RANGE.max}`).optional(),
  // null turns the weekly check off
  weeklyLimitHours: z.number({ error: 'expected a number of hours, or null for no weekly check' }).min(1, 'must be between 1 and 168').max(168, 'must be between 1 and 168').nullable().optional()
}).strict()

type Reader = Pick<AppDatabase, 'select'>

/** The work rules in force: the stored setting over the defaults (a damaged setting falls back to them). */
export function loadWorkRules(db: Reader): OperatorWorkRules {
  const row = db.select({ value: settings.value }).from(settings).where(eq(settings.key, WORK_RULES_SETTING_KEY)).get()
  const stored = StoredWorkRulesSchema.safeParse(row?.value ?? {})
  return { ...DEFAULT_WORK_RULES, ...(stored.success ? stored.data : {}) }
}

/** Changes the work rules and records who did, in one transaction. */
export function saveWorkRules(db: AppDatabase, actorId: number, patch: z.infer<typeof WorkRulesPatchSchema>): OperatorWorkRules {
  return db.transaction((tx) => {
    const before = loadWorkRules(tx)
    const next = { ...before, ...patch }
    tx.insert(settings).values({ key: WORK_RULES_SETTING_KEY, value: next })
      .onConflictDoUpdate({ target: settings.key, set: { value: next } }).run()
    recordAudit(tx, actorId, 'settings.work-rules', 'settings', null, { before, after: next })
    return next
  })
}
