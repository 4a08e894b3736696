import { z } from 'zod'
import { ASSET_KINDS } from '#shared/utils/asset-schemas'

const ParamsSchema = z.object({ kind: z.enum(ASSET_KINDS), id: z.uuid() })
const QuerySchema = z.object({ limit: z.coerce.number().int().min(1).max(500).default(100) })

// The asset's timeline: every edit and event, newest first, with who and when.
export default defineEventHandler(async (event) => {
  const { kind, id } = validateParams(event, ParamsSchema)
  const { limit } = validateQuery(event, QuerySchema)
  await findAssetForActor(event, kind, id)
  const rows = await useDb()
    .select({ id: tables.auditLog.id, at: tables.auditLog.at, action: tables.auditLog.action, note: tables.auditLog.note, before: tables.auditLog.before, after: tables.auditLog.after, userName: tables.users.name })
    .from(tables.auditLog)
    .leftJoin(tables.users, eq(tables.users.id, tables.auditLog.userId))
    .where(and(eq(tables.auditLog.entity, kind), eq(tables.auditLog.entityId, id)))
    .orderBy(desc(tables.auditLog.at), desc(tables.auditLog.id))
    .limit(limit)
  return { items: rows.map(r => ({ id: r.id, at: r.at, action: r.action, note: r.note, who: r.userName ?? 'System', changes: changedFields(r.before, r.after) })) }
})

function changedFields(before: unknown, after: unknown): { field: string, from: unknown, to: unknown }[] {
  if (!before || !after || typeof before !== 'object' || typeof after !== 'object') return []
  const b = before as Record<string, unknown>
  const a = after as Record<string, unknown>
  return Object.keys(a)
    .filter(k => !['updatedAt', 'createdAt'].includes(k) && JSON.stringify(a[k]) !== JSON.stringify(b[k]))
    .map(k => ({ field: k, from: b[k] ?? null, to: a[k] ?? null }))
}
