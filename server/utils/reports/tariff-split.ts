import type { SQL } from 'drizzle-orm'
import { rowsOf, uuidArray } from '../due/effective'
import { monthArray, closedChargesOf } from './charge-months'
import { num, scopeCte, type ReportScope } from './scope'

// The share of a charge's time inside the site's peak windows (0 … 1), for a row `alias` with at, ended_at,
// tz (the site's time zone) and periods (its peakPeriods).
export function peakShare(alias: string): SQL {
  if (!/^[a-z]\w*$/.test(alias)) throw new Error(`not an alias: ${alias}`)
  return sql.raw(`CASE WHEN ch.ended_at > ch.at THEN coalesce((
               SELECT sum(EXTRACT(EPOCH FROM greatest(interval '0', least(ch.ended_at, w.t_end) - greatest(ch.at, w.t_start))))
               -- local days as timestamps without zone (dates alone would be read as instants in the session's zone)
               FROM generate_series((ch.at AT TIME ZONE ch.tz)::date::timestamp, (ch.ended_at AT TIME ZONE ch.tz)::date::timestamp, interval '1 day') AS d(day)
               CROSS JOIN jsonb_array_elements(ch.periods) AS p(period)
               CROSS JOIN LATERAL (SELECT (d.day + (p.period->>'start')::time) AT TIME ZONE ch.tz AS t_start,
                                          (d.day + (p.period->>'end')::time) AT TIME ZONE ch.tz AS t_end) w
               WHERE p.period->'days' @> to_jsonb(extract(isodow FROM d.day)::int)
             ), 0) / EXTRACT(EPOCH FROM ch.ended_at - ch.at) ELSE 0 END`.replaceAll('ch.', `${alias}.`))
}

export interface PeakSplit { siteId: string, site: string, kwh: number, peakKwh: number, peakPerKwh: number, offPeakPerKwh: number }

// Each site's standing closed charges in the range, with the kWh drawn in its peak windows: a charge's kWh
// are taken as drawn evenly from putting on to taking off, so its peak kWh = kWh × (hours inside a window ÷
// its hours). A window is a site-local clock range on the days it lists (ISO weekdays), turned into instants
// with the site's time zone on each local day the charge spans, so daylight-saving days keep their clock.
// Restates shared/utils/tariff.ts peakHours for speed; tests/e2e/reports-tariff.test.ts compares the two.
// The whole months in `kept` come from their kept rows (charge-months.ts).
export async function peakSplit(scope: ReportScope, kept: string[] = []): Promise<PeakSplit[]> {
  const rows = await rowsOf<Record<string, unknown>>(useDb(), sql`
    WITH ${scopeCte(scope)},
    charges AS (
      SELECT scope.site_id, scope.tz, c.at, c.ended_at, coalesce(c.grid_kwh, 0) AS kwh, st.settings->'peakPeriods' AS periods
      FROM ${closedChargesOf(kept)} JOIN sites st ON st.id = scope.site_id
      WHERE jsonb_typeof(st.settings->'peakPeriods') = 'array' AND jsonb_array_length(st.settings->'peakPeriods') > 0
    ),
    shares AS (
      SELECT ch.site_id, ch.kwh,
             ${peakShare('ch')} AS peak_share
      FROM charges ch
    )
    ${kept.length
      ? sql`, kept AS (
      SELECT site_id, sum(kwh) AS kwh, sum(peak_kwh) AS peak_kwh FROM charge_month_rollups
      WHERE site_id = ANY(${uuidArray(scope.siteIds)}) AND month = ANY(${monthArray(kept)}) GROUP BY site_id
    )`
      : sql`, kept AS (SELECT NULL::uuid AS site_id, 0::float8 AS kwh, 0::float8 AS peak_kwh WHERE false)`}
    SELECT st.id AS "siteId", st.name AS site, (coalesce(sum(s.kwh), 0) + coalesce(max(k.kwh), 0))::float8 AS kwh,
           (coalesce(sum(s.kwh * s.peak_share), 0) + coalesce(max(k.peak_kwh), 0))::float8 AS "peakKwh"
    FROM scope JOIN sites st ON st.id = scope.site_id LEFT JOIN shares s ON s.site_id = scope.site_id LEFT JOIN kept k ON k.site_id = scope.site_id
    GROUP BY st.id, st.name ORDER BY st.name`)
  const settings = new Map(scope.sites.map(s => [s.id, s.settings]))
  return rows.map((r) => {
    const s = settings.get(String(r.siteId))!
    return { siteId: String(r.siteId), site: String(r.site), kwh: num(r.kwh), peakKwh: num(r.peakKwh), peakPerKwh: s.peakPerKwh, offPeakPerKwh: s.tariffPerKwh }
  }).filter(r => settings.get(r.siteId)!.peakPeriods.length > 0)
}
