import { addCalendarInterval, calendarDaysBetween } from '../../shared/utils/due-dates'
import { assessFill, fillLimitLb, PREFILL_INSPECTION_ITEMS, PROPANE_DEFAULT_SG, tareLossFlagsRequalification } from '../../shared/utils/lp-gas'
import { nextRequalificationDue, firstRequalificationDue, REQUALIFICATION_MARK_SUFFIX, type RequalificationMethod } from '../../shared/utils/requalification'
import { cylinderRequalificationDue, requalificationYearsFromSettings } from '../../shared/utils/fuel-policy'
import { prefillFailedReason } from '../../shared/utils/fuel-reasons'
import { addMinutes, DAY_MS, HOUR_MS } from './clock'
import type { SeedContext, SiteKey } from './context'
import { HISTORY_DAYS } from './battery-history'
import { roundTo } from './random'
import type { CylinderRow, TruckRow } from './rows'
import { PROPANE_PER_GAL } from './people'

type Build = 'steel' | 'aluminium' | 'steel43'
type Special = 'overdue' | 'due_soon' | 'quarantine' | 'condemn' | null

interface PlannedCylinder {
  row: CylinderRow
  special: Special
  /** Requalifications that passed, oldest first (performed date, method). */
  requalified: Array<{ on: string, method: RequalificationMethod }>
}

const COUNTS: Record<SiteKey, Record<Build, number>> = {
  mb: { steel: 28, aluminium: 16, steel43: 6 },
  fx: { steel: 18, aluminium: 9, steel43: 3 },
}

// Cylinders with their specials: one past its requalification date, three due within 90 days,
// one to be refused for a dent (quarantined), one that fails its requalification (condemned).
export function buildCylinders(ctx: SeedContext): PlannedCylinder[] {
  const { rand, clock, newId } = ctx
  const registeredMonth = addCalendarInterval(clock.dateOf(ctx.registeredAt), -1, 'month')
  const maxYear = Number(registeredMonth.slice(0, 4))
  const maxMonth = Number(registeredMonth.slice(5, 7))
  const specials: Record<SiteKey, Array<{ build: Build, special: Special, made?: [number, number], dueInDays?: number }>> = {
    mb: [
      { build: 'steel', special: 'overdue', made: [2013, 9] },
      { build: 'steel', special: 'due_soon', dueInDays: 15 },
      { build: 'aluminium', special: 'due_soon', dueInDays: 55 },
      { build: 'steel', special: 'quarantine' },
    ],
    fx: [
      { build: 'steel', special: 'due_soon', dueInDays: 35 },
      { build: 'steel', special: 'condemn', made: [2016, 4] },
    ],
  }
  const planned: PlannedCylinder[] = []
  for (const site of ['mb', 'fx'] as const) {
    const ordered: Array<{ build: Build, special: Special, made?: [number, number], dueInDays?: number }> = []
    for (const build of ['steel', 'aluminium', 'steel43'] as const) {
      const own = specials[site].filter(s => s.build === build)
      ordered.push(...own, ...Array.from({ length: COUNTS[site][build] - own.length }, () => ({ build, special: null as Special })))
    }
    rand.shuffle(ordered).forEach((item, i) => {
      let year: number
      let month: number
      if (item.made) [year, month] = item.made
      else if (item.dueInDays !== undefined) {
        const due = addCalendarInterval(clock.today, item.dueInDays, 'day')
        year = Number(due.slice(0, 4)) - 12
        month = Number(due.slice(5, 7))
      }
      else {
        year = rand.int(2014, maxYear)
        month = rand.int(1, year === maxYear ? maxMonth : 12)
      }
      const big = item.build === 'steel43'
      const waterCapacityLb = roundTo(big ? rand.between(104, 104.5) : rand.between(80, 80.6), 1)
      const tareLb = roundTo(item.build === 'aluminium' ? rand.between(17, 19) : big ? rand.between(35.5, 38) : rand.between(27, 30), 1)
      const row: CylinderRow = {
        id: newId(),
        siteId: ctx.sites[site].id,
        serial: `QL${site === 'mb' ? 'M' : 'F'}-${String(year).slice(2)}${String(4100 + i * 3).padStart(4, '0')}`,
        areaId: ctx.sites[site].fuelStation.id,
        specification: item.build === 'aluminium' ? 'dot_4e' : 'dot_4bw',
        waterCapacityLb,
        tareLb,
        nominalPropaneLb: big ? 43.5 : 33.5,
        manufactureYear: year,
        manufactureMonth: month,
        status: 'empty',
        createdAt: ctx.registeredAt,
        updatedAt: ctx.registeredAt,
      }
      planned.push({ row, special: item.special, requalified: [] })
    })
  }
  // Regular cylinders whose first date would fall due soon were requalified by external visual inspection.
  const horizon = addCalendarInterval(clock.today, 120, 'day')
  const years = requalYears(ctx)
  const earliest = clock.dateDaysAgo(390)
  const latest = clock.dateDaysAgo(14)
  for (const c of planned) {
    if (c.special) continue
    let due = firstRequalificationDue(c.row.manufactureYear, c.row.manufactureMonth)
    while (due <= horizon) {
      const from = [addCalendarInterval(due, -18, 'month'), earliest].sort()[1]!
      const to = [addCalendarInterval(due, -2, 'month'), latest].sort()[0]!
      const span = Math.max(0, calendarDaysBetween(from, to))
      const on = from <= to ? addCalendarInterval(from, rand.int(0, span), 'day') : to
      c.requalified.push({ on, method: 'external_visual' })
      due = nextRequalificationDue(on, 'external_visual', years)
    }
    const last = c.requalified.at(-1)
    if (last) {
      c.row.lastRequalifiedOn = last.on
      c.row.lastRequalificationMethod = last.method
    }
  }
  return planned
}

export function requalYears(ctx: SeedContext): Record<RequalificationMethod, number> {
  return requalificationYearsFromSettings(ctx.settings)
}

// The requalification due date as it stood on a given day (later requalifications not yet done).
function dueOn(ctx: SeedContext, c: PlannedCylinder, date: string): string {
  const done = c.requalified.filter(r => r.on <= date).at(-1)
  return cylinderRequalificationDue({
    manufactureYear: c.row.manufactureYear,
    manufactureMonth: c.row.manufactureMonth,
    lastRequalifiedOn: done?.on ?? null,
    lastRequalificationMethod: done?.method ?? null,
  }, requalYears(ctx))
}

export function requalificationMarking(on: string, method: RequalificationMethod): string {
  const suffix = REQUALIFICATION_MARK_SUFFIX[method]
  return `${on.slice(5, 7)}-${on.slice(2, 4)}${suffix ? ` ${suffix}` : ''}`
}

interface CylinderSim {
  c: PlannedCylinder
  status: 'full' | 'empty' | 'in_use' | 'quarantined' | 'condemned'
  truckId: string | null
  changedAt: Date
  residualLb: number
}

type FuelEvent
  = | { at: Date, kind: 'exchange', truck: TruckRow, site: SiteKey }
    | { at: Date, kind: 'refill', site: SiteKey }

// A year of cylinder changes on the LP-gas trucks and refills by weight at the cage.
export function simulateFuelStation(ctx: SeedContext, cylinders: PlannedCylinder[], combustion: TruckRow[]) {
  const { rand, clock, rows, newId } = ctx
  const historyStart = clock.daysAgo(HISTORY_DAYS)
  const lpTrucks = combustion.filter(t => t.power === 'lp_gas')
  const siteOf = (siteId: string): SiteKey => (siteId === ctx.sites.mb.id ? 'mb' : 'fx')
  const sims: CylinderSim[] = cylinders.map(c => ({ c, status: c.special === 'overdue' ? 'empty' : rand.chance(0.65) ? 'full' : 'empty', truckId: null, changedAt: new Date(historyStart.getTime() - rand.between(2, 60) * HOUR_MS), residualLb: rand.between(0.3, 2.5) }))
  const overdue = sims.find(s => s.c.special === 'overdue')!
  overdue.changedAt = ctx.registeredAt
  for (const truck of lpTrucks) {
    const s = sims.find(x => x.c.row.siteId === truck.siteId && x.status !== 'in_use' && !x.c.special)!
    s.status = 'in_use'
    s.truckId = truck.id
  }
  const quarantineFrom = clock.daysAgo(12)
  const condemnFrom = clock.daysAgo(80)
  const events: FuelEvent[] = []
  for (const truck of lpTrucks) {
    const hours = rand.between(1, 23)
    for (let k = 0; k < HISTORY_DAYS; k++) {
      if (k >= 1 && rand.chance(0.08)) continue
      events.push({ at: clock.hoursAgo(hours + 24 * k), kind: 'exchange', truck, site: siteOf(truck.siteId) })
    }
  }
  // Refilling rounds: every other day at Millbrook, twice a week at Fenwick, the last ones a day or two ago
  // so both cages hold some empties now.
  const rounds: Array<[SiteKey, number, number]> = [['mb', 30, 48], ['fx', 50, 84]]
  for (const [site, lastHoursAgo, everyHours] of rounds) {
    for (let at = clock.hoursAgo(lastHoursAgo); at > historyStart; at = new Date(at.getTime() - everyHours * HOUR_MS)) {
      events.push({ at, kind: 'refill', site })
    }
  }
  events.sort((a, b) => a.at.getTime() - b.at.getTime())
  const inspectionPass = Object.fromEntries(PREFILL_INSPECTION_ITEMS.map(i => [i.key, 'pass' as const]))
  let skippedExchanges = 0

  for (const event of events) {
    if (event.at > clock.now) break
    const siteId = ctx.sites[event.site].id
    if (event.kind === 'exchange') {
      const off = sims.find(s => s.truckId === event.truck.id)!
      const full = sims.filter(s => s.c.row.siteId === siteId && s.status === 'full' && s.changedAt <= event.at).sort((a, b) => a.changedAt.getTime() - b.changedAt.getTime())
      const priority = full.find(s => (s.c.special === 'quarantine' && event.at > new Date(quarantineFrom.getTime() - 3 * DAY_MS))
        || (s.c.special === 'condemn' && event.at > new Date(condemnFrom.getTime() - 3 * DAY_MS)))
      const on = priority ?? full[0]
      if (!on) {
        skippedExchanges += 1
        continue
      }
      rows.cylinderExchanges.push({ id: newId(), siteId, userId: ctx.sites[event.site].people.operator, at: event.at, recordedAt: new Date(event.at.getTime() + rand.int(2, 30) * 1000), truckId: event.truck.id, cylinderOffId: off.c.row.id, cylinderOnId: on.c.row.id, hourMeter: exchangeHours(event.truck.hourMeter ?? 0, clock.now, event.at) })
      Object.assign(off, { status: 'empty', truckId: null, changedAt: event.at, residualLb: rand.between(0.3, 2.5) })
      Object.assign(on, { status: 'in_use', truckId: event.truck.id, changedAt: event.at })
      continue
    }
    const date = clock.dateOf(event.at)
    const technician = event.site === 'mb' || date < ctx.fenwickLpExpiredOn ? ctx.sites[event.site].people.technician : ctx.lpRefillerId
    let at = event.at
    for (const s of sims.filter(x => x.c.row.siteId === siteId && x.status === 'empty')) {
      at = addMinutes(at, rand.int(3, 6))
      const row = s.c.row
      // each refill keeps the site's price of its day, as the app does: two cents a gallon less for each month back
      const pricePerGal = roundTo(PROPANE_PER_GAL[event.site] - 0.02 * Math.floor((clock.now.getTime() - at.getTime()) / (30 * DAY_MS)), 2)
      const base = { id: newId(), siteId, userId: technician, at, recordedAt: new Date(at.getTime() + rand.int(2, 30) * 1000), cylinderId: row.id, pricePerGal }
      if (s.c.special === 'quarantine' && at >= quarantineFrom) {
        const failed = PREFILL_INSPECTION_ITEMS.filter(item => item.key === 'dents')
        const reason = 'Dent in the shell above the foot ring, about 1 in across.'
        // the refusal as the app stores it: the English words and the same as codes for each reader's words
        const refusal = prefillFailedReason(failed.map(i => i.key), failed.map(i => i.label))
        rows.cylinderRefills.push({ ...base, inspection: { ...inspectionPass, dents: 'fail' }, refused: true, refusalReasons: [refusal.message], refusalWords: [{ code: refusal.code, params: refusal.params }], productSg: PROPANE_DEFAULT_SG, fillLimitLb: fillLimitLb(row.waterCapacityLb, PROPANE_DEFAULT_SG), note: reason })
        const heldAt = addMinutes(at, 2)
        row.outOfService = true
        row.outOfServiceReason = reason
        hold(ctx, row.siteId, technician, heldAt, row.id, reason, { before: { status: 'empty', outOfService: false }, after: { status: 'quarantined', outOfService: true, reason }, note: `Quarantined: ${reason}` })
        Object.assign(s, { status: 'quarantined', changedAt: heldAt })
        continue
      }
      if (s.c.special === 'condemn' && at >= condemnFrom) {
        const performedOn = addCalendarInterval(date, 2, 'day')
        const performedAt = clock.at(performedOn, 11)
        const reason = `Condemned at requalification on ${performedOn}`
        const facilities = ctx.sites[event.site].people.facilities
        const requalId = newId()
        rows.requalifications.push({ id: requalId, siteId, userId: facilities, at: performedAt, recordedAt: performedAt, cylinderId: row.id, performedOn, method: 'external_visual', marking: requalificationMarking(performedOn, 'external_visual'), passed: false, nextDueOn: null, note: 'Pitting on the lower shell beyond the limit; the requalifier condemned it.' })
        row.outOfService = true
        row.outOfServiceReason = reason
        hold(ctx, row.siteId, facilities, performedAt, row.id, reason, null)
        rows.auditLog.push({ at: performedAt, userId: facilities, siteId, action: 'condemned', entity: 'requalification', entityId: requalId, after: { cylinderId: row.id, performedOn, method: 'external_visual', passed: false } })
        Object.assign(s, { status: 'condemned', changedAt: performedAt })
        continue
      }
      // Never fill a cylinder past its requalification date (49 CFR 180.209).
      if (dueOn(ctx, s.c, date) < date) continue
      const limit = fillLimitLb(row.waterCapacityLb, PROPANE_DEFAULT_SG)!
      const grossBeforeLb = roundTo(row.tareLb + s.residualLb, 1)
      const grossAfterLb = roundTo(row.tareLb + Math.min(row.nominalPropaneLb * rand.between(0.965, 1), limit - 0.1), 1)
      const fill = assessFill({ waterCapacityLb: row.waterCapacityLb, tareLb: row.tareLb, grossBeforeLb, grossAfterLb, sg: PROPANE_DEFAULT_SG })
      if (!fill.ok || fill.overfilled) throw new Error(`seed fill of ${row.serial} does not pass its own check`)
      const measuredTareLb = rand.chance(0.12) ? roundTo(row.tareLb - rand.between(0, 0.3), 1) : null
      rows.cylinderRefills.push({
        ...base,
        inspection: inspectionPass,
        grossBeforeLb,
        grossAfterLb,
        measuredTareLb,
        productSg: PROPANE_DEFAULT_SG,
        netAddedLb: fill.netAddedLb,
        fillLimitLb: fill.fillLimitLb,
        overfilled: fill.overfilled,
        gallonsAt60F: fill.gallonsAt60F,
        tareFlagged: measuredTareLb !== null && tareLossFlagsRequalification(row.tareLb, measuredTareLb),
      })
      Object.assign(s, { status: 'full', changedAt: at })
    }
  }

  for (const s of sims) {
    s.c.row.status = s.status
    s.c.row.currentTruckId = s.truckId
    s.c.row.statusChangedAt = s.changedAt
    s.c.row.updatedAt = s.changedAt > ctx.registeredAt ? s.changedAt : ctx.registeredAt
  }
  for (const c of cylinders) {
    for (const r of c.requalified) {
      const site = siteOf(c.row.siteId)
      rows.requalifications.push({
        id: newId(),
        siteId: c.row.siteId,
        userId: ctx.sites[site].people.facilities,
        at: clock.at(r.on, 11),
        recordedAt: clock.at(r.on, 11),
        cylinderId: c.row.id,
        performedOn: r.on,
        method: r.method,
        marking: requalificationMarking(r.on, r.method),
        passed: true,
        nextDueOn: nextRequalificationDue(r.on, r.method, requalYears(ctx)),
        note: 'External visual inspection by the cylinder supplier.',
      })
    }
  }
  // Fenwick's cage is kept close to its storage limit: the limit is the next 50 lb step above the full stock.
  const fxFull = cylinders.filter(c => c.row.siteId === ctx.sites.fx.id && c.row.status === 'full').reduce((sum, c) => sum + c.row.nominalPropaneLb, 0)
  ctx.sites.fx.fuelStation.lpStorageLimitLb = Math.max(300, Math.ceil(fxFull / 0.97 / 50) * 50)
  return { skippedExchanges, fxFullLb: fxFull }
}

function hold(ctx: SeedContext, siteId: string, userId: string, at: Date, cylinderId: string, reason: string, audit: { before: object, after: object, note: string } | null) {
  ctx.rows.assetHolds.push({ id: ctx.newId(), siteId, userId, at, recordedAt: at, assetKind: 'cylinder', assetId: cylinderId, action: 'hold', reason })
  if (audit) ctx.rows.auditLog.push({ at, userId, siteId, action: 'out_of_service', entity: 'cylinder', entityId: cylinderId, ...audit })
}

/** The hour meter at a cylinder change: the truck's reading now less about 11 h of use a day since (invented). */
function exchangeHours(hoursNow: number, now: Date, at: Date): number {
  return Math.max(0, Math.round((hoursNow - (now.getTime() - at.getTime()) / 86_400_000 * 11) * 10) / 10)
}
