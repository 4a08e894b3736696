import type { SpecificGravityPolicy } from '../../shared/utils/specific-gravity'
import { summarizeElectrolyteReadings } from '../../shared/utils/battery-room-schemas'
import { addMinutes, DAY_MS } from './clock'
import type { SeedContext } from './context'
import type { BatteryHistory, SimCharge } from './battery-history'
import type { Fleet, PlannedBattery } from './fleet'
import { roundTo } from './random'

interface PlannedCheck {
  battery: PlannedBattery
  at: Date
  everyCell: boolean
}

const WATER_AFTER_DAYS = 4.5
const EVERY_CELL_AFTER_DAYS = 26
const OVERDUE_WATERING_DAYS = 18

// Watering after a charge about weekly, with a pilot-cell hydrometer reading each time and every cell
// about monthly; three batteries show a weak cell in their latest every-cell reading.
export function writeElectrolyteChecks(ctx: SeedContext, fleet: Fleet, history: BatteryHistory) {
  const { clock, rand, rows, settings } = ctx
  const policy: SpecificGravityPolicy = { referenceTempF: settings.sgReferenceTempF, correctionPerDegF: settings.sgCorrectionPerDegF }
  const byBattery = new Map<string, SimCharge[]>()
  for (const c of history.charges) {
    if (c.open) continue
    const list = byBattery.get(c.battery.row.id) ?? []
    list.push(c)
    byBattery.set(c.battery.row.id, list)
  }
  const weak = new Set([
    fleet.electric.find(e => e.truck.fleetNumber === 'MB-03')!.pair[0].id,
    fleet.electric.find(e => e.truck.fleetNumber === 'MB-11')!.pair[1].id,
    fleet.electric.find(e => e.truck.fleetNumber === 'FX-04')!.pair[0].id,
  ])
  const wateringCutoff = clock.daysAgo(OVERDUE_WATERING_DAYS)

  const planned: PlannedCheck[] = []
  for (const battery of fleet.batteries) {
    if (battery.row.chemistry !== 'flooded_lead_acid') continue
    const list = (byBattery.get(battery.row.id) ?? []).sort((a, b) => a.end.getTime() - b.end.getTime())
    const swapIns = history.swapIns.get(battery.row.id) ?? []
    let lastWatering = clock.daysAgo(365 + rand.between(0, 4)).getTime()
    let lastEveryCell = lastWatering - rand.between(0, 20) * DAY_MS
    const mine: PlannedCheck[] = []
    list.forEach((c, i) => {
      const at = addMinutes(c.end, rand.int(20, 75))
      const nextIn = swapIns.find(t => t > c.end)
      if (at > clock.now || (nextIn && at >= nextIn)) return
      if (battery.role === 'watering_overdue' && at > wateringCutoff) return
      const last = i === list.length - 1
      const due = (at.getTime() - lastWatering) / DAY_MS >= WATER_AFTER_DAYS
      // Keep every other battery's watering current as of today.
      const catchUp = last && battery.role !== 'watering_overdue' && (clock.now.getTime() - lastWatering) / DAY_MS >= 6
      if (!due && !catchUp) return
      const everyCell = (at.getTime() - lastEveryCell) / DAY_MS >= EVERY_CELL_AFTER_DAYS
      mine.push({ battery, at, everyCell })
      lastWatering = at.getTime()
      if (everyCell) lastEveryCell = at.getTime()
    })
    planned.push(...mine)
  }

  const baseline = new Map(fleet.batteries.map(b => [b.row.id, rand.between(1.279, 1.287)]))
  const latestEveryCell = new Map<string, Date>()
  for (const p of planned) {
    if (p.everyCell && (latestEveryCell.get(p.battery.row.id) ?? new Date(0)) < p.at) latestEveryCell.set(p.battery.row.id, p.at)
  }
  planned.sort((a, b) => a.at.getTime() - b.at.getTime())

  for (const p of planned) {
    const b = p.battery.row
    const site = b.siteId === ctx.sites.mb.id ? ctx.sites.mb : ctx.sites.fx
    const checkId = ctx.newId()
    const checkOffset = rand.between(-0.004, 0.004)
    const checkTemp = rand.between(74, 92)
    const cells = p.everyCell ? Array.from({ length: b.cellCount }, (_, i) => i + 1) : [p.battery.pilotCell]
    const isWeak = weak.has(b.id)
    const weakCell = Math.min(b.cellCount, p.battery.pilotCell + 3)
    const latest = latestEveryCell.get(b.id)?.getTime() === p.at.getTime()
    const entered = cells.map((cellNumber) => {
      let sg = Math.min(1.295, Math.max(1.270, baseline.get(b.id)! + checkOffset + rand.between(-0.004, 0.004)))
      if (isWeak && cellNumber === weakCell) sg -= latest ? rand.between(0.040, 0.055) : rand.between(0.006, 0.012)
      const temperatureF = Math.round(Math.min(95, Math.max(70, checkTemp + rand.between(-1.5, 1.5))))
      return { cellNumber, specificGravity: roundTo(sg, 3), temperatureF }
    })
    // Corrected to the reference temperature with the same summary the check form and route use.
    const summary = summarizeElectrolyteReadings(entered, policy, settings.cellSpreadThreshold)
    const level = rand.chance(0.12) ? 'low' as const : 'ok' as const
    const water = b.cellCount * rand.between(0.045, 0.075) * (level === 'low' ? 1.3 : 1)
    rows.electrolyteChecks.push({
      id: checkId,
      siteId: b.siteId,
      userId: site.people.technician,
      at: p.at,
      recordedAt: new Date(p.at.getTime() + rand.int(5, 90) * 1000),
      batteryId: b.id,
      level,
      waterAddedGal: roundTo(water, 1),
      scope: p.everyCell ? 'every_cell' : 'pilot_cell',
      referenceTempF: policy.referenceTempF,
      correctionPerDegF: policy.correctionPerDegF,
      meanCorrectedSg: summary.meanCorrectedSg,
      spread: p.everyCell ? summary.spread : null,
      lowCellCount: summary.lowCells.length,
      stateOfChargePct: summary.stateOfChargePct,
      afterCharge: true,
      note: summary.lowCells.length > 0 ? `Cell ${summary.lowCells.join(', ')} reads low against the rest; watch it at the next equalize.` : '',
    })
    for (const c of summary.cells) rows.cellReadings.push({ checkId, ...c })
  }
  return { weak }
}
