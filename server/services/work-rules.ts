import { eq } from 'drizzle-orm'
import { z } from 'zod'
import { settings } from '../db/schema'
import type { AppDatabase } from '../utils/db'
import { recordAudit } from './audit'
import type { WorkRules } from '../core/planning/conflicts'

// Defaults: 11 h daily rest from EU Working Time Directive 2003/88/EC, art. 3; a 12 h longest shift
// is common practice in field rosters. Both are settings because local law, agreements and the
// employer's procedures decide the real figures.
export const DEFAULT_WORK_RULES: WorkRules = { minRestHours: 11, maxShiftHours: 12 }
export const WORK_RULES_SETTING_KEY = 'work-rules'

const StoredWorkRulesSchema = z.object({
  minRestHours: z.number().min(0).max(24),
  maxShiftHours: z.number().min(1).max(168)
}).partial()

export const WorkRulesPatchSchema = z.object({
  minRestHours: z.number({ error: 'expected a number of hours' }).min(0, 'must be between 0 and 24').max(24, 'must be between 0 and 24').optional(),
  maxShiftHours: z.number({ error: 'expected a number of hours' }).min(1, 'must be between 1 and 168').max(168, 'must be between 1 and 168').optional()
}).strict()

type Reader = Pick<AppDatabase, 'select'>

/** The work rules in force: the stored setting over the defaults (a damaged setting falls back to them). */
export function loadWorkRules(db: Reader): WorkRules {
  const row = db.select({ value: settings.value }).from(settings).where(eq(settings.key, WORK_RULES_SETTING_KEY)).get()
  const stored = StoredWorkRulesSchema.safeParse(row?.value ?? {})
  return { ...DEFAULT_WORK_RULES, ...(stored.success ? stored.data : {}) }
}

/** Changes the work rules and records who did, in one transaction. */
export function saveWorkRules(db: AppDatabase, actorId: number, patch: z.infer<typeof WorkRulesPatchSchema>): WorkRules {
  return db.transaction((tx) => {
    const before = loadWorkRules(tx)
    const next = { ...before, ...patch }
    tx.insert(settings).values({ key: WORK_RULES_SETTING_KEY, value: next })
      .onConflictDoUpdate({ target: settings.key, set: { value: next } }).run()
    recordAudit(tx, actorId, 'settings.work-rules', 'settings', null, { before, after: next })
    return next
  })
}
