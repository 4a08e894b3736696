import { sql } from 'drizzle-orm'
import { BATTERY_STATE_LABELS, batteryStateAt, type BatteryState } from '../../shared/utils/battery-state'
import type { StoredBatteryState } from '../../shared/utils/derived-battery'
import type { SeedContext } from './context'
import type { SeedDatabase } from './database'

// What the Bay board, cylinder cages and due list show right after seeding, read from the read models the
// rebuild just computed with the app's own rules.
export async function boardSummary(db: SeedDatabase, ctx: SeedContext): Promise<string> {
  const now = ctx.clock.now
  const states = new Map<BatteryState, number>()
  const rows = await db.execute<{ state: StoredBatteryState, readyMs: number | null }>(sql`
    SELECT state, (EXTRACT(EPOCH FROM ready_at) * 1000)::float8 AS "readyMs" FROM battery_status`)
  for (const r of rows) {
    const { state } = batteryStateAt(r.state, r.readyMs === null ? null : new Date(Number(r.readyMs)), now)
    states.set(state, (states.get(state) ?? 0) + 1)
  }
  const board = [...states.entries()].map(([s, n]) => `${BATTERY_STATE_LABELS[s]} ${n}`).join(', ')
  const today = ctx.clock.today
  const count = async (kind: string) => {
    const [r] = await db.execute<{ overdue: number, soon: number, upcoming: number }>(sql`
      SELECT count(*) FILTER (WHERE due_on < ${today}::date)::int AS overdue,
        count(*) FILTER (WHERE due_on >= ${today}::date AND due_on <= ${today}::date + due_soon_days)::int AS soon,
        count(*) FILTER (WHERE due_on > ${today}::date + due_soon_days)::int AS upcoming
      FROM obligations WHERE kind = ${kind}`)
    return r!
  }
  const [requal, emissions, watering] = await Promise.all([count('cylinder_requalification'), count('emissions_test'), count('battery_watering')])
  const cages = [ctx.sites.mb.fuelStation, ctx.sites.fx.fuelStation].map((area) => {
    const mine = ctx.rows.lpCylinders.filter(c => c.areaId === area.id)
    const full = mine.filter(c => c.status === 'full')
    const fullLb = full.reduce((sum, c) => sum + c.nominalPropaneLb, 0)
    return `${area.name}: ${full.length} full (${fullLb} lb of ${area.lpStorageLimitLb} lb limit), ${mine.filter(c => c.status === 'empty').length} empty, ${mine.filter(c => c.status === 'in_use').length} in use`
  })
  return [
    `Bay board now: ${board}.`,
    `Battery watering: ${watering.overdue} overdue, ${watering.soon} due soon, ${watering.upcoming} upcoming.`,
    `Cylinder requalification: ${requal.overdue} overdue, ${requal.soon} due soon, ${requal.upcoming} upcoming.`,
    ...cages.map(c => `Cylinder cage — ${c}.`),
    `Emissions tests: ${emissions.overdue} overdue, ${emissions.soon} due soon, ${emissions.upcoming} upcoming.`,
  ].join('\n')
}
