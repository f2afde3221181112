import { auditLog } from '../db/schema'
import type { AppDatabase } from '../utils/db'

type Writer = Pick<AppDatabase, 'insert'>

/** Writes one audit entry; pass the transaction so the entry lands with the change or not at all. */
export function recordAudit(db: Writer, actorId: number | null, action: string, entity: string, entityId: number | null, detail?: Record<string, unknown>) {
  db.insert(auditLog).values({ actorId, action, entity, entityId, detail: detail ?? null }).run()
}
