import { closedMonthsInside } from '#shared/utils/report-math'
import { isEffectiveRecord, rowsOf, uuidArray } from '../due/effective'
import { peakShare } from './tariff-split'
import type { ReportScope } from './scope'

// The energy report's closed months (table charge_month_rollups): a report over a year reads the whole
// months inside its range from one row per site and month, and only its first and last months from the
// charge records. A month is kept once it has been over for a day everywhere (so every site's month has
// ended); a trigger on charge_sessions drops a kept month when a record of it changes (migration 0018).

// months are 'YYYY-MM', made here, never typed by a person
export const monthArray = (months: readonly string[]) => sql`${`{${months.join(',')}}`}::text[]`

// (site, month) pairs as a row source `p(site_id, month)`
const pairsSql = (pairs: readonly { siteId: string, month: string }[]) =>
  sql`unnest(${uuidArray(pairs.map(p => p.siteId))}, ${monthArray(pairs.map(p => p.month))}) AS p(site_id, month)`

// every site of the scope with every month
const pairsOf = (siteIds: string[], months: string[]) => pairsSql(siteIds.flatMap(siteId => months.map(month => ({ siteId, month }))))

/**
 * Makes sure every site of the scope has its kept row for each month, made under the site's present time
 * zone and peak windows, and says whether they can stand for the records: false when a month's last charge
 * ended after the range (its hours would be cut at the range's end), and the report then reads the records.
 */
export async function ensureChargeMonths(scope: ReportScope, months: string[]): Promise<boolean> {
  if (months.length === 0) return true
  const db = useDb()
  const pairs = pairsOf(scope.siteIds, months)
  const missing = await rowsOf<{ siteId: string, month: string }>(db, sql`
    SELECT p.site_id AS "siteId", p.month FROM ${pairs}
    JOIN sites s ON s.id = p.site_id
    LEFT JOIN charge_month_rollups r ON r.site_id = p.site_id AND r.month = p.month
      AND r.time_zone = s.time_zone AND r.peak_periods = coalesce(s.settings->'peakPeriods', '[]'::jsonb)
    WHERE r.site_id IS NULL ORDER BY 1, 2`)
  if (missing.length > 0) await makeChargeMonths(missing)
  const [row] = await rowsOf<{ usable: boolean }>(db, sql`
    SELECT coalesce(bool_and(r.latest_end IS NULL OR r.latest_end < (${scope.to}::date + 1)::timestamp AT TIME ZONE s.time_zone), true) AS usable
    FROM ${pairs} JOIN sites s ON s.id = p.site_id JOIN charge_month_rollups r ON r.site_id = p.site_id AND r.month = p.month`)
  return row?.usable !== false
}

// Each month under an exclusive lock on it (in the trigger's order), so a write of that month still in
// flight commits first and is read, and one that starts later drops the row again.
async function makeChargeMonths(missing: { siteId: string, month: string }[]) {
  const pairs = pairsSql(missing)
  await useDb().transaction(async (tx) => {
    await tx.execute(sql`
      SELECT pg_advisory_xact_lock(hashtext('charge_month_rollups'), hashtext(p.site_id::text || p.month))
      FROM (SELECT * FROM ${pairs} ORDER BY 1, 2) p`)
    await tx.execute(sql`
      WITH months AS (
        SELECT p.site_id, p.month, s.time_zone AS tz, coalesce(s.settings->'peakPeriods', '[]'::jsonb) AS periods,
               to_date(p.month, 'YYYY-MM')::timestamp AT TIME ZONE s.time_zone AS t0,
               (to_date(p.month, 'YYYY-MM') + interval '1 month')::timestamp AT TIME ZONE s.time_zone AS t1
        FROM ${pairs} JOIN sites s ON s.id = p.site_id
        -- (a report that asked at the same moment may have made it while this one waited for the lock)
        WHERE NOT EXISTS (SELECT 1 FROM charge_month_rollups r WHERE r.site_id = p.site_id AND r.month = p.month
          AND r.time_zone = s.time_zone AND r.peak_periods = coalesce(s.settings->'peakPeriods', '[]'::jsonb))
      ),
      charges AS (
        SELECT m.site_id, m.month, c.charger_id, c.grid_kwh, c.energy_cost, c.ended_at,
               EXTRACT(EPOCH FROM (c.ended_at - c.at)) / 3600 AS hours,
               CASE WHEN jsonb_typeof(m.periods) = 'array' AND jsonb_array_length(m.periods) > 0 THEN coalesce(c.grid_kwh, 0) * ${peakShare('ch')} ELSE 0 END AS peak_kwh
        FROM months m JOIN charge_sessions c ON c.site_id = m.site_id AND c.at >= m.t0 AND c.at < m.t1
        CROSS JOIN LATERAL (SELECT c.at, c.ended_at, m.tz, m.periods) ch
        WHERE c.ended_at IS NOT NULL AND ${isEffectiveRecord('charge_sessions', 'c')}
      ),
      per_charger AS (
        SELECT site_id, month, charger_id, count(*)::int AS n, coalesce(sum(grid_kwh), 0)::float8 AS kwh,
               coalesce(sum(energy_cost), 0)::float8 AS cost, coalesce(sum(hours), 0)::float8 AS hours,
               coalesce(sum(peak_kwh), 0)::float8 AS peak_kwh, max(ended_at) AS latest_end
        FROM charges GROUP BY site_id, month, charger_id
      )
      INSERT INTO charge_month_rollups (site_id, month, chargers, kwh, peak_kwh, latest_end, time_zone, peak_periods)
      SELECT m.site_id, m.month,
             coalesce(jsonb_object_agg(pc.charger_id, jsonb_build_array(pc.n, pc.kwh, pc.cost, pc.hours)) FILTER (WHERE pc.charger_id IS NOT NULL), '{}'::jsonb),
             coalesce(sum(pc.kwh), 0), coalesce(sum(pc.peak_kwh), 0), max(pc.latest_end), m.tz, m.periods
      FROM months m LEFT JOIN per_charger pc ON pc.site_id = m.site_id AND pc.month = m.month
      GROUP BY m.site_id, m.month, m.tz, m.periods
      ON CONFLICT (site_id, month) DO UPDATE SET chargers = excluded.chargers, kwh = excluded.kwh, peak_kwh = excluded.peak_kwh,
        latest_end = excluded.latest_end, time_zone = excluded.time_zone, peak_periods = excluded.peak_periods, made_at = now()`)
  })
}

/** The kept months' charges as rows like the records': charger, month, count, kWh, cost, hours. */
export function keptChargeRows(scope: ReportScope, months: string[]) {
  return sql`
    SELECT (e.key)::uuid AS charger_id, r.month, (e.value->>0)::int AS n, (e.value->>1)::float8 AS grid_kwh,
           (e.value->>2)::float8 AS energy_cost, (e.value->>3)::float8 AS hours
    FROM charge_month_rollups r CROSS JOIN LATERAL jsonb_each(r.chargers) e
    WHERE r.site_id = ANY(${uuidArray(scope.siteIds)}) AND r.month = ANY(${monthArray(months)})`
}

/** The whole closed months of the scope's range, each site's row made where missing; none when the rows cannot stand for the records. */
export async function keptChargeMonths(scope: ReportScope, today = new Date().toISOString().slice(0, 10)): Promise<string[]> {
  const months = closedMonthsInside(scope.from, scope.to, today)
  return months.length > 0 && await ensureChargeMonths(scope, months) ? months : []
}

/**
 * The standing, closed charge records of the scope (CTE `scope`: site_id, tz, t0, t1 …) as `c`, each site
 * beside its `scope` row: the whole range, or with kept months the part before them and the part after, in the
 * site's time zone. One scan of the (site_id, at) index per site and part: a plain join let PostgreSQL, which
 * cannot tell how few rows a range holds, read the whole table instead.
 */
export function closedChargesOf(kept: string[]) {
  const ranges = kept.length === 0
    ? sql`(SELECT scope.*, scope.t0 AS r0, scope.t1 AS r1 FROM scope) scope`
    : sql`(SELECT scope.*, scope.t0 AS r0, ${`${kept[0]}-01`}::timestamp AT TIME ZONE scope.tz AS r1 FROM scope
         UNION ALL SELECT scope.*, (${`${kept[kept.length - 1]}-01`}::date + interval '1 month')::timestamp AT TIME ZONE scope.tz, scope.t1 FROM scope) scope`
  return sql`${ranges} CROSS JOIN LATERAL (
    SELECT c.* FROM charge_sessions c
    WHERE c.site_id = scope.site_id AND c.at >= scope.r0 AND c.at < scope.r1 AND c.ended_at IS NOT NULL AND ${isEffectiveRecord('charge_sessions', 'c')}
    OFFSET 0) c`
}
