import { batteryTruckFit, chargerBatteryMatch } from '../../shared/utils/battery-fit'
import { energyCost, gridEnergyKwh, isCountedCycle, ranHot } from '../../shared/utils/charging'
import { addHours, addMinutes, DAY_MS, HOUR_MS } from './clock'
import type { SeedContext, SiteKey } from './context'
import { batterySpec, chargerSpec, truckSpec, type ElectricTruck, type Fleet, type PlannedBattery } from './fleet'
import { roundTo } from './random'
import { defaultSchedules } from '../../shared/utils/due-schedules'
import type { ChargerRow } from './rows'

/** The default equalize schedule (every 5th charge or 7 days): the simulated technicians keep to it. */
const EQUALIZE = (({ every, withinDays }) => ({ every: every ?? 5, withinDays: withinDays ?? 7 }))(defaultSchedules().find(s => s.kind === 'battery_equalize')!)

export const HISTORY_DAYS = 365

interface BatterySim {
  planned: PlannedBattery
  inTruck: string | null
  lastRemovedAt: Date | null
  lastChargeEnd: Date
  chargesSinceEqualize: number
  lastEqualizedAt: Date
  heldAt: Date | null
  /** Taken out of a truck and left uncharged (a "needs charge" spare on the bay board). */
  leftUncharged: boolean
  hotChargesLeft: number
  swapIns: Date[]
}

export interface SimCharge {
  id: string
  battery: PlannedBattery
  charger: ChargerRow
  start: Date
  end: Date
  equalize: boolean
  ampHours: number
  endTempF: number
  open: boolean
}

export interface BatteryHistory {
  charges: SimCharge[]
  /** Times each battery went into a truck, in order. */
  swapIns: Map<string, Date[]>
  heldAt: Map<string, Date>
  skippedSwaps: number
}

type SimEvent
  = | { at: Date, kind: 'swap', truck: ElectricTruck, daysAgo: number, midShift?: boolean }
    | { at: Date, kind: 'refresh', battery: BatterySim }

// A year of battery changes and charges, played forward in time so no battery sits in two trucks
// and no charger carries two batteries at once.
export function simulateBatteryRoom(ctx: SeedContext, fleet: Fleet): BatteryHistory {
  const { rand, clock, settings, newId, rows } = ctx
  const coolMs = settings.coolDownMinutes * 60_000
  const historyStart = clock.daysAgo(HISTORY_DAYS)
  const siteOf = (siteId: string): SiteKey => (siteId === ctx.sites.mb.id ? 'mb' : 'fx')
  const sims = new Map<string, BatterySim>()
  for (const planned of fleet.batteries) {
    sims.set(planned.row.id, {
      planned,
      inTruck: null,
      lastRemovedAt: null,
      lastChargeEnd: new Date(historyStart.getTime() - 20 * HOUR_MS),
      chargesSinceEqualize: rand.int(0, 3),
      lastEqualizedAt: new Date(historyStart.getTime() - rand.between(1, 5) * DAY_MS),
      heldAt: planned.plan?.heldDaysAgo ? clock.daysAgo(planned.plan.heldDaysAgo) : null,
      leftUncharged: false,
      hotChargesLeft: 0,
      swapIns: [],
    })
  }
  const sim = (id: string) => sims.get(id)!
  const current = new Map<string, string>()
  // Each electric truck starts the year with its first battery fitted (a swap record, as the app keeps it).
  for (const e of fleet.electric) {
    current.set(e.truck.id, e.pair[0].id)
    sim(e.pair[0].id).inTruck = e.truck.id
    rows.batterySwaps.push({
      id: newId(), siteId: e.truck.siteId, userId: ctx.sites[siteOf(e.truck.siteId)].people.operator,
      at: historyStart, recordedAt: historyStart, truckId: e.truck.id, batteryOutId: null, batteryInId: e.pair[0].id,
      hourMeter: e.truck.hourMeter ?? 0,
    })
  }
  // One battery ran hot twice in the last month.
  const hot = fleet.electric.find(e => e.truck.fleetNumber === 'MB-06')!.pair[0].id
  const chargerBusy = new Map<string, Date>(fleet.chargers.map(c => [c.id, historyStart]))
  const charges: SimCharge[] = []
  let skippedSwaps = 0

  const events: SimEvent[] = []
  for (const truck of fleet.electric) {
    for (let k = 0; k < HISTORY_DAYS; k++) {
      if (k >= 2 && rand.chance(0.07)) continue
      events.push({ at: clock.hoursAgo(truck.hoursSinceSwap + 24 * k), kind: 'swap', truck, daysAgo: k })
      // now and then a battery runs low mid-shift and the truck comes back for an extra change
      if (k >= 8 && rand.chance(0.01)) events.push({ at: clock.hoursAgo(truck.hoursSinceSwap + 24 * k - rand.between(9, 13)), kind: 'swap', truck, daysAgo: k, midShift: true })
    }
  }
  // Batteries not in a rotation get a freshening charge every six days; a spare that is to be fitted
  // in the last days is freshened the day before it goes in.
  for (const s of sims.values()) {
    if (s.planned.role === 'pair') continue
    let offsetHours = rand.between(8, 6 * 24)
    const plan = s.planned.plan
    if (plan?.forcedTruck) {
      const truck = fleet.electric.find(e => e.truck.fleetNumber === plan.forcedTruck)!
      offsetHours = truck.hoursSinceSwap + 24 * plan.forcedDaysAgo! + 16
    }
    for (let at = clock.hoursAgo(offsetHours); at > historyStart; at = new Date(at.getTime() - 6 * DAY_MS)) {
      events.push({ at, kind: 'refresh', battery: s })
    }
  }
  events.sort((a, b) => a.at.getTime() - b.at.getTime())

  const ready = (s: BatterySim, at: Date) => s.inTruck === null
    && !(s.heldAt && s.heldAt <= at)
    && !s.leftUncharged
    && s.lastChargeEnd.getTime() <= at.getTime() - coolMs
    && (s.lastRemovedAt === null || s.lastChargeEnd > s.lastRemovedAt)

  const charge = (s: BatterySim, wanted: Date, refresh: boolean, maxWaitHours = 4): boolean => {
    const b = s.planned.row
    const candidates = fleet.chargers.filter(c => c.areaId === b.homeAreaId && chargerBatteryMatch(chargerSpec(c), batterySpec(b)).length === 0)
    for (let step = 0; step <= maxWaitHours * 4; step++) {
      const start = addMinutes(wanted, step * 15 + rand.int(0, 4))
      const free = candidates.filter(c => chargerBusy.get(c.id)! <= start)
      if (free.length === 0) continue
      const charger = rand.pick(free)
      const lithium = b.chemistry === 'lithium_ion'
      // Equalize on the site's rule (every 5th charge or weekly, whichever comes first), two days early on the weekly count so a charge every other day keeps it current.
      const daysSinceEqualize = (start.getTime() - s.lastEqualizedAt.getTime()) / DAY_MS
      const equalize = !lithium && (s.chargesSinceEqualize >= EQUALIZE.every - 1 || daysSinceEqualize >= EQUALIZE.withinDays - 2)
      s.chargesSinceEqualize = equalize ? 0 : s.chargesSinceEqualize + 1
      let hours: number
      let fraction: number
      let temp: number
      if (refresh) {
        hours = rand.between(2.5, 3.5) + (equalize ? 1 : 0)
        fraction = rand.between(0.08, 0.14) * (equalize ? 1.3 : 1)
        temp = rand.between(84, 96)
      }
      else if (lithium) {
        hours = rand.between(3, 3.75)
        fraction = rand.between(0.55, 0.8)
        temp = rand.between(80, 95)
      }
      else {
        hours = rand.between(7.5, 8) + (equalize ? 1 : 0)
        fraction = rand.between(0.55, 0.8) * (equalize ? 1.06 : 1)
        temp = rand.between(90, 112)
      }
      const end = addHours(start, hours)
      if (b.id === hot && !refresh && start > clock.daysAgo(30) && s.hotChargesLeft > 0) {
        temp = s.hotChargesLeft === 2 ? 117.4 : 119.1
        s.hotChargesLeft -= 1
      }
      chargerBusy.set(charger.id, end)
      s.lastChargeEnd = end
      if (equalize) s.lastEqualizedAt = end
      charges.push({ id: newId(), battery: s.planned, charger, start, end, equalize, ampHours: Math.round(b.capacityAh * fraction), endTempF: roundTo(temp, 1), open: false })
      return true
    }
    return false
  }
  sim(hot).hotChargesLeft = 2

  for (const event of events) {
    if (event.at > clock.now) break
    if (event.kind === 'refresh') {
      const s = event.battery
      const heldSoon = s.heldAt && s.heldAt.getTime() < event.at.getTime() + 8 * HOUR_MS
      if (s.inTruck || heldSoon || s.leftUncharged) continue
      if (s.lastChargeEnd.getTime() > event.at.getTime() - DAY_MS) continue
      charge(s, event.at, true, s.planned.plan?.forcedTruck ? 4 : 16)
      continue
    }
    const { truck, daysAgo } = event
    const outId = current.get(truck.truck.id)!
    const out = sim(outId)
    const fits = (s: BatterySim) => batteryTruckFit(truckSpec(truck.truck), batterySpec(s.planned.row)).length === 0
    const spares = [...sims.values()].filter(s => s.planned.row.siteId === truck.truck.siteId && s.planned.group === truck.group && s.planned.role !== 'pair')
    const forced = spares.find(s => s.planned.plan?.forcedTruck === truck.truck.fleetNumber && s.planned.plan.forcedDaysAgo === daysAgo && ready(s, event.at))
    let chosen: BatterySim | undefined = forced
    if (!chosen && daysAgo >= 8 && rand.chance(0.03)) {
      chosen = spares.find(s => s.planned.role === 'ready' && ready(s, event.at) && fits(s))
    }
    if (!chosen) {
      chosen = truck.pair.map(b => sim(b.id)).filter(s => s.planned.row.id !== outId && ready(s, event.at))
        .sort((a, b) => a.lastChargeEnd.getTime() - b.lastChargeEnd.getTime())[0]
    }
    // A mid-shift change takes a ready spare when the bay has one (about two times in three: the others are
    // held for the next shift); else it finds the other battery charged but still cooling, and the technician
    // lets it go out with a written override (what the shift-change shortfall report counts). No such
    // battery: no change.
    let override: { reason: string, checks: { code: string, message: string, params: { minutes: number } }[] } | null = null
    const readySpare = event.midShift && rand.chance(0.65) ? spares.find(s => s.planned.role === 'ready' && ready(s, event.at) && fits(s)) : undefined
    if (readySpare) chosen = readySpare
    else if (event.midShift) {
      chosen = truck.pair.map(b => sim(b.id)).find(s => s.planned.row.id !== outId && s.inTruck === null && !s.leftUncharged && !ready(s, event.at)
        && !(s.heldAt && s.heldAt <= event.at) && s.lastChargeEnd <= event.at && (s.lastRemovedAt === null || s.lastChargeEnd > s.lastRemovedAt))
      if (!chosen || !fits(chosen)) continue
      // the check as the app stores it: its code, the minutes of cool-down left and the words
      const minutes = Math.max(1, Math.ceil((coolMs - (event.at.getTime() - chosen.lastChargeEnd.getTime())) / 60_000))
      override = { reason: 'Battery ran low mid-shift, no cooled battery in the bay; fitted warm', checks: [{ code: 'still_cooling', message: `Battery is still cooling after its charge: ${minutes} min left.`, params: { minutes } }] }
    }
    if (!chosen || !fits(chosen)) {
      skippedSwaps += 1
      continue
    }
    const hourMeter = roundTo((truck.truck.hourMeter ?? 0) + (event.at.getTime() - historyStart.getTime()) / DAY_MS * truck.hoursPerDay, 1)
    rows.batterySwaps.push({
      id: newId(),
      siteId: truck.truck.siteId,
      userId: ctx.sites[siteOf(truck.truck.siteId)].people[override ? 'technician' : 'operator'],
      at: event.at,
      recordedAt: new Date(event.at.getTime() + rand.int(2, 40) * 1000),
      truckId: truck.truck.id,
      batteryOutId: outId,
      batteryInId: chosen.planned.row.id,
      hourMeter,
      ...(override ? { overrideReason: override.reason, overriddenChecks: override.checks } : {}),
    })
    out.inTruck = null
    out.lastRemovedAt = event.at
    chosen.inTruck = truck.truck.id
    chosen.swapIns.push(event.at)
    current.set(truck.truck.id, chosen.planned.row.id)
    if (out.planned.role === 'needs_charge') out.leftUncharged = true
    // no charger free within the hour: the technician puts it on the first one that comes free that day
    // (a battery of the pair left uncharged would stay so for the rest of the year)
    else if (!charge(out, addMinutes(event.at, 30), false, override ? 24 : 4)) charge(out, addMinutes(event.at, 30), false, 24)
  }

  // The truck hour meters read on from their last change.
  for (const truck of fleet.electric) {
    truck.truck.hourMeter = roundTo((truck.truck.hourMeter ?? 0) + HISTORY_DAYS * truck.hoursPerDay, 1)
  }

  const started = charges.filter(c => c.start <= clock.now)
  for (const c of started) c.open = c.end > clock.now
  return {
    charges: started,
    swapIns: new Map([...sims.values()].map(s => [s.planned.row.id, s.swapIns])),
    heldAt: new Map([...sims.values()].filter(s => s.heldAt).map(s => [s.planned.row.id, s.heldAt!])),
    skippedSwaps,
  }
}

// Charge-session rows with energy, cost and cycle counting from shared/utils/charging.ts.
export function writeChargeSessions(ctx: SeedContext, history: BatteryHistory) {
  const { settings, rows, rand } = ctx
  const cycles = new Map<string, number>()
  for (const c of history.charges) {
    const b = c.battery.row
    const site = b.siteId === ctx.sites.mb.id ? ctx.sites.mb : ctx.sites.fx
    const technician = site.people.technician
    const base = {
      id: c.id,
      siteId: b.siteId,
      userId: technician,
      at: c.start,
      recordedAt: new Date(c.start.getTime() + rand.int(2, 40) * 1000),
      batteryId: b.id,
      chargerId: c.charger.id,
      equalize: c.equalize,
    }
    if (c.open) {
      rows.chargeSessions.push(base)
      continue
    }
    const kwh = gridEnergyKwh(c.ampHours, b.voltage, c.charger.efficiency ?? 0.85)
    const counted = isCountedCycle({ complete: true, ampHoursReturned: c.ampHours, ratedAh: b.capacityAh })
    if (counted) cycles.set(b.id, (cycles.get(b.id) ?? 0) + 1)
    rows.chargeSessions.push({
      ...base,
      endedAt: c.end,
      endedBy: technician,
      ampHoursReturned: c.ampHours,
      endTempF: c.endTempF,
      outcome: 'complete',
      gridKwh: kwh,
      energyCost: energyCost(kwh, settings.tariffPerKwh),
      countedCycle: counted,
      ranHot: ranHot(c.endTempF, settings.maxChargeTempF),
    })
  }
  return cycles
}
