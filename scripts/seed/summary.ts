import { BATTERY_STATE_LABELS, deriveBatteryState, type BatteryState } from '../../shared/utils/battery-state'
import { firstRequalificationDue, nextRequalificationDue, requalificationStatus } from '../../shared/utils/requalification'
import { obligationState } from '../../shared/utils/due-dates'
import type { BatteryHistory } from './battery-history'
import type { SeedContext } from './context'
import type { Fleet } from './fleet'
import { requalYears } from './fuel'

// What the bay board, cylinder cages and due list show right after seeding, worked out with the app's own rules.
export function boardSummary(ctx: SeedContext, fleet: Fleet, history: BatteryHistory): string {
  const { rows, clock, settings } = ctx
  const removed = new Map<string, Date>()
  for (const s of rows.batterySwaps) {
    if (s.batteryOutId && s.at && (removed.get(s.batteryOutId) ?? new Date(0)) < s.at) removed.set(s.batteryOutId, s.at)
  }
  const states = new Map<BatteryState, number>()
  for (const b of fleet.batteries) {
    const mine = history.charges.filter(c => c.battery.row.id === b.row.id)
    const open = mine.find(c => c.open)
    const closed = mine.filter(c => !c.open).sort((x, y) => y.end.getTime() - x.end.getTime())[0]
    const { state } = deriveBatteryState({
      outOfService: b.row.outOfService ?? false,
      installedInTruck: b.row.currentTruckId != null,
      chargeOpenSince: open?.start ?? null,
      lastChargeEndedAt: closed?.end ?? null,
      lastChargeComplete: true,
      lastRemovedFromTruckAt: removed.get(b.row.id) ?? null,
    }, { coolDownMinutes: settings.coolDownMinutes }, clock.now)
    states.set(state, (states.get(state) ?? 0) + 1)
  }
  const board = [...states.entries()].map(([s, n]) => `${BATTERY_STATE_LABELS[s]} ${n}`).join(', ')

  const requal = { overdue: 0, due_soon: 0, current: 0 }
  for (const c of rows.lpCylinders) {
    const due = c.lastRequalifiedOn && c.lastRequalificationMethod
      ? nextRequalificationDue(c.lastRequalifiedOn, c.lastRequalificationMethod, requalYears(ctx))
      : firstRequalificationDue(c.manufactureYear, c.manufactureMonth)
    requal[requalificationStatus(due, clock.today).status] += 1
  }
  const cages = [ctx.sites.mb.fuelStation, ctx.sites.fx.fuelStation].map((area) => {
    const mine = rows.lpCylinders.filter(c => c.areaId === area.id)
    const full = mine.filter(c => c.status === 'full')
    const fullLb = full.reduce((sum, c) => sum + c.nominalPropaneLb, 0)
    return `${area.name}: ${full.length} full (${fullLb} lb of ${area.lpStorageLimitLb} lb limit), ${mine.filter(c => c.status === 'empty').length} empty, ${mine.filter(c => c.status === 'in_use').length} in use`
  })
  const latestTest = new Map<string, { testedOn: string, nextDueOn: string }>()
  for (const t of rows.emissionsTests) {
    if ((latestTest.get(t.truckId)?.testedOn ?? '') < t.testedOn) latestTest.set(t.truckId, t)
  }
  const emissions = { overdue: 0, due_soon: 0, upcoming: 0 }
  for (const t of latestTest.values()) emissions[obligationState(t.nextDueOn, clock.today, settings.dueSoonDays)] += 1

  return [
    `Bay board now: ${board}.`,
    `Cylinder requalification: ${requal.overdue} overdue, ${requal.due_soon} due within 90 days, ${requal.current} current.`,
    ...cages.map(c => `Cylinder cage — ${c}.`),
    `Emissions tests (latest per truck): ${emissions.overdue} overdue, ${emissions.due_soon} due soon, ${emissions.upcoming} upcoming.`,
  ].join('\n')
}
