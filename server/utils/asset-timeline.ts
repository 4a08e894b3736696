import type { AssetKind } from '#shared/utils/asset-schemas'
import type { HistoryEntry } from './asset-history'

const AUDIT_TITLES: Record<string, string> = {
  create: 'Added to Bayward', update: 'Record edited', out_of_service: 'Taken out of service',
  return_to_service: 'Returned to service', retag: 'Re-tagged', import: 'Imported from CSV',
}

// An asset's timeline: its audit rows and every registered event source, newest first.
export async function assetTimeline(kind: AssetKind, id: string, limit: number): Promise<HistoryEntry[]> {
  const rows = await useDb()
    .select({ id: tables.auditLog.id, at: tables.auditLog.at, action: tables.auditLog.action, note: tables.auditLog.note, before: tables.auditLog.before, after: tables.auditLog.after, userName: tables.users.name })
    .from(tables.auditLog)
    .leftJoin(tables.users, eq(tables.users.id, tables.auditLog.userId))
    .where(and(eq(tables.auditLog.entity, kind), eq(tables.auditLog.entityId, id)))
    .orderBy(desc(tables.auditLog.at), desc(tables.auditLog.id))
    .limit(limit)
  const audit: HistoryEntry[] = rows.map(r => ({
    id: `audit-${r.id}`,
    at: r.at,
    title: AUDIT_TITLES[r.action] ?? r.action,
    ...(AUDIT_TITLES[r.action] ? { titleWords: { code: `audit_${r.action}` } } : {}),
    who: r.userName ?? 'System',
    detail: r.note,
    ...quarantineWords(r.action, r.after),
    tone: r.action === 'out_of_service' ? 'danger' : undefined,
    changes: r.action === 'update' ? changedFields(r.before, r.after) : undefined,
  }))
  const more = await Promise.all(historySourcesFor(kind).map(source => source(id, limit)))
  return [...audit, ...more.flat()]
    .sort((a, b) => new Date(b.at).getTime() - new Date(a.at).getTime())
    .slice(0, limit)
}

// A cylinder quarantined (its note "Quarantined: <why>"): the same as codes, so the reader gets the word in theirs.
function quarantineWords(action: string, after: unknown): Pick<HistoryEntry, 'detailWords'> {
  const a = after as { status?: unknown, reason?: unknown } | null
  return action === 'out_of_service' && a?.status === 'quarantined' && typeof a.reason === 'string'
    ? { detailWords: [{ code: 'quarantined', params: { note: a.reason } }] }
    : {}
}

function changedFields(before: unknown, after: unknown): { field: string, from: unknown, to: unknown }[] {
  if (!before || !after || typeof before !== 'object' || typeof after !== 'object') return []
  const b = before as Record<string, unknown>
  const a = after as Record<string, unknown>
  return Object.keys(a)
    .filter(k => !['updatedAt', 'createdAt'].includes(k) && JSON.stringify(a[k]) !== JSON.stringify(b[k]))
    .map(k => ({ field: k, from: b[k] ?? null, to: a[k] ?? null }))
}
