import type { DbOrTx } from './db'
import type { Actor } from './auth'

export interface AuditEntry {
  /** who did it (a job names its owner) */
  actor: Pick<Actor, 'user'> | { user: { id: string } } | null
  siteId: string | null
  action: string
  entity: string
  entityId: string
  before?: unknown
  after?: unknown
  note?: string
}

// Every change to a record writes one audit row, inside the same transaction as the change.
export async function writeAudit(tx: DbOrTx, entry: AuditEntry) {
  await tx.insert(tables.auditLog).values({
    userId: entry.actor?.user.id ?? null,
    siteId: entry.siteId,
    action: entry.action,
    entity: entry.entity,
    entityId: entry.entityId,
    before: entry.before ?? null,
    after: entry.after ?? null,
    note: entry.note ?? null,
  })
}
