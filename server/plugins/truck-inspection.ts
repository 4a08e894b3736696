import type { HistoryEntry } from '../utils/asset-history'

// Pre-shift inspections on a truck: the inspection hold as the truck's state (29 CFR 1910.178(q)(7)), the
// last check as a flag, and the checks and returns to service on its timeline.
export default defineNitroPlugin(() => {
  // the hold and the last check, read with the truck in the tag look-up's statement, or here
  registerAssetFacts('truck', 'inspection', table => sql`(SELECT json_build_object('holdReason', ts.hold_reason, 'lastInspectionMs', ${epochMs('ts.last_inspection_at')})
    FROM truck_status ts WHERE ts.truck_id = ${table}.id)`)
  registerAssetStatus('truck', async (row) => {
    const came = factsCameWithAsset<{ holdReason: string | null, lastInspectionMs: number | null } | null>(row, 'inspection')
    const [s] = came !== undefined
      ? (came ? [{ holdReason: came.holdReason, lastInspectionAt: dateFromMs(came.lastInspectionMs) }] : [])
      : await useDb().select({ holdReason: tables.truckStatus.holdReason, lastInspectionAt: tables.truckStatus.lastInspectionAt })
          .from(tables.truckStatus).where(eq(tables.truckStatus.truckId, row.id))
    if (s?.holdReason) {
      return { state: 'inspection_hold', label: 'Out of service after inspection', tone: 'danger' as const, flags: [{ key: 'inspection_hold', label: s.holdReason, tone: 'danger' as const }] }
    }
    const at = s?.lastInspectionAt
    return { flags: [at
      ? { key: 'inspection_last', label: `Last pre-shift check ${at.toISOString().slice(0, 16).replace('T', ' ')} UTC`, params: { at: at.toISOString() }, tone: 'neutral' as const }
      : { key: 'inspection_none', label: 'No pre-shift check on record', tone: 'caution' as const }] }
  })

  registerHistorySource('truck', async (truckId, limit): Promise<HistoryEntry[]> => {
    const db = useDb()
    const i = tables.truckInspections
    const r = tables.truckReturns
    const [checks, returns] = await Promise.all([
      db.select({ row: i, who: tables.users.name }).from(i).innerJoin(tables.users, eq(tables.users.id, i.userId)).where(eq(i.truckId, truckId)).orderBy(desc(i.at)).limit(limit),
      db.select({ row: r, who: tables.users.name }).from(r).innerJoin(tables.users, eq(tables.users.id, r.userId)).where(eq(r.truckId, truckId)).orderBy(desc(r.at)).limit(limit),
    ])
    return [
      ...checks.map(({ row, who }): HistoryEntry => ({
        id: `inspection-${row.id}`, at: row.at, who,
        ...historyLine(
          row.criticalFailed.length ? { code: 'preshift_out_of_service' } : row.failedCount ? { code: 'preshift_items_failed', params: { n: row.failedCount } } : { code: 'preshift_passed' },
          [...(row.criticalFailed.length ? [{ code: 'preshift_failed_items', params: { checks: row.criticalFailed.join('; ') } }] : []), ...(row.hourMeter !== null ? [{ code: 'hour_meter', params: { hours: row.hourMeter } }] : [])],
        ),
        tone: row.criticalFailed.length ? 'danger' : row.failedCount ? 'warning' : 'safe',
      })),
      ...returns.map(({ row, who }): HistoryEntry => ({ id: `return-${row.id}`, at: row.at, who, ...historyLine({ code: 'audit_return_to_service' }, row.whatWasDone ? [{ code: 'note', params: { note: row.whatWasDone } }] : []), tone: 'safe' })),
    ]
  })
})
