import { addCalendarInterval, localDate } from '#shared/utils/due-dates'
import { localDayStart } from '#shared/utils/shift-times'

/** The most rows the overrides page lists for one range of days; it says so when there are more. */
export const OVERRIDES_SHOWN = 500
/** The days the page covers when none are asked for: the last 90, today included. */
const DEFAULT_DAYS = 90

// Swaps and charges that went ahead despite a refused check or with a recorded warning, newest first, within a
// range of the site's days (the last 90 unless asked): the newest `limit` of both kinds together (the page's
// OVERRIDES_SHOWN, the CSV's more), and `more` when the range holds others.
export async function batteryRoomOverrides(siteId: string, timeZone: string, range: { from?: string, to?: string } = {}, limit = OVERRIDES_SHOWN) {
  const to = range.to ?? localDate(new Date(), timeZone)
  const from = range.from ?? addCalendarInterval(to, -(DEFAULT_DAYS - 1), 'day')
  const start = localDayStart(from, timeZone).toISOString()
  const end = localDayStart(addCalendarInterval(to, 1, 'day'), timeZone).toISOString()
  const db = useDb()
  const [swaps, charges] = await Promise.all([
    db.execute(sql`
      SELECT s.id, (EXTRACT(EPOCH FROM s.at) * 1000)::float8 AS "atMs", s.override_reason AS "overrideReason", s.overridden_checks AS "checks",
             u.name AS "who", t.fleet_number AS "truck", bi.serial AS "batteryIn", bo.serial AS "batteryOut"
      FROM battery_swaps s
      JOIN users u ON u.id = s.user_id
      JOIN trucks t ON t.id = s.truck_id
      JOIN batteries bi ON bi.id = s.battery_in_id
      LEFT JOIN batteries bo ON bo.id = s.battery_out_id
      WHERE s.site_id = ${siteId} AND s.overridden_checks IS NOT NULL AND s.at >= ${start}::timestamptz AND s.at < ${end}::timestamptz
      ORDER BY s.at DESC LIMIT ${limit + 1}`),
    db.execute(sql`
      SELECT c.id, (EXTRACT(EPOCH FROM c.at) * 1000)::float8 AS "atMs", c.override_reason AS "overrideReason", u.name AS "who", b.serial AS "battery", ch.name AS "charger"
      FROM charge_sessions c
      JOIN users u ON u.id = c.user_id
      JOIN batteries b ON b.id = c.battery_id
      JOIN chargers ch ON ch.id = c.charger_id
      WHERE c.site_id = ${siteId} AND c.override_reason IS NOT NULL AND c.at >= ${start}::timestamptz AND c.at < ${end}::timestamptz
      ORDER BY c.at DESC LIMIT ${limit + 1}`),
  ])
  const iso = (v: unknown) => new Date(Number(v)).toISOString()
  const items = [
    ...(swaps as unknown as Record<string, unknown>[]).map(s => ({
      id: `swap-${s.id}`, kind: 'swap' as const, at: iso(s.atMs), who: s.who as string,
      what: `Battery ${s.batteryIn} into truck ${s.truck}${s.batteryOut ? ` (out: ${s.batteryOut})` : ''}`,
      whatWords: { code: s.batteryOut ? 'swap_out' : 'swap', params: { battery: String(s.batteryIn), truck: String(s.truck), ...(s.batteryOut ? { out: String(s.batteryOut) } : {}) } },
      reason: (s.overrideReason as string | null) ?? null, checks: (s.checks as FitReason[] | null) ?? [],
    })),
    ...(charges as unknown as Record<string, unknown>[]).map(c => ({
      id: `charge-${c.id}`, kind: 'charge' as const, at: iso(c.atMs), who: c.who as string,
      what: `Battery ${c.battery} on charger ${c.charger}`, whatWords: { code: 'charge', params: { battery: String(c.battery), charger: String(c.charger) } }, reason: c.overrideReason as string, checks: [] as FitReason[],
    })),
  ].sort((a, b) => b.at.localeCompare(a.at))
  return { from, to, items: items.slice(0, limit), more: items.length > limit }
}

// battery: the one fitted (a swap) or put on charge; batteryOut: the one a swap took out
export const OVERRIDES_CSV_COLUMNS = ['at', 'kind', 'who', 'truck', 'battery', 'batteryOut', 'charger', 'checks', 'checkMessages', 'reason'] as const

/** One CSV row per override: the record's parts in columns of their own, the checks as codes and as recorded. */
export function overridesCsvRows(items: Awaited<ReturnType<typeof batteryRoomOverrides>>['items']): unknown[][] {
  return items.map((o) => {
    const p = o.whatWords.params as Record<string, string | undefined>
    return [
      o.at, o.kind, o.who, p.truck ?? '', p.battery ?? '', p.out ?? '', p.charger ?? '',
      o.checks.map(c => c.code).join(';'), o.checks.map(c => c.message).join(' | '), o.reason ?? '',
    ]
  })
}
