import { gridEnergyKwh, energyCost, isCountedCycle, ranHot } from '#shared/utils/charging'
import { summarizeElectrolyteReadings } from '#shared/utils/battery-room-schemas'
import type { ChargeCorrection, ElectrolyteCorrection, SwapCorrection } from '#shared/utils/correction-schemas'
import type { Transaction } from '../db'
import type { Actor } from '../auth'
import type { CorrectionKindSpec } from '../corrections'

type SwapRow = typeof tables.batterySwaps.$inferSelect
type ChargeRow = typeof tables.chargeSessions.$inferSelect
type CheckRow = typeof tables.electrolyteChecks.$inferSelect
type WithId<T> = T & { id: string }

const swapSpec: CorrectionKindSpec<SwapRow> = {
  kind: 'battery-swap', table: tables.batterySwaps,
  subjects: s => [
    { kind: 'truck', id: s.truckId }, { kind: 'battery', id: s.batteryInId },
    ...(s.batteryOutId ? [{ kind: 'battery' as const, id: s.batteryOutId }] : []),
  ],
}

async function batteryAtSite(tx: Transaction, siteId: string, id: string, field: string) {
  const [battery] = await tx.select().from(tables.batteries).where(and(eq(tables.batteries.id, id), eq(tables.batteries.siteId, siteId)))
  if (!battery) throw badField(field, 'no_such_battery', 'No such battery at this site.')
  return battery
}

// A battery change corrected: another truck, battery or hour meter. Where every battery is follows from
// the effective swaps, so the row is all it writes; both rows' batteries and trucks are recomputed.
export async function correctBatterySwap(actor: Actor, input: WithId<SwapCorrection>) {
  return correctRecord(actor, swapSpec, input.id, input, async (tx, original) => {
    const [truck] = await tx.select().from(tables.trucks).where(and(eq(tables.trucks.id, input.truckId), eq(tables.trucks.siteId, original.siteId)))
    if (!truck) throw badField('truckId', 'no_such_truck', 'No such truck.')
    if (truck.power !== 'electric') throw badField('truckId', 'truck_not_electric', `Truck ${truck.fleetNumber} is not electric; it takes no battery.`, { truck: truck.fleetNumber })
    await batteryAtSite(tx, original.siteId, input.batteryInId, 'batteryInId')
    if (input.batteryOutId) await batteryAtSite(tx, original.siteId, input.batteryOutId, 'batteryOutId')
    await hourMeterInOrder(tx, truck.id, original.id, original.at, input.hourMeter)
    return {
      values: {
        truckId: truck.id, batteryInId: input.batteryInId, batteryOutId: input.batteryOutId, hourMeter: input.hourMeter,
        overrideReason: original.overrideReason, overriddenChecks: original.overriddenChecks,
      },
    }
  })
}

const chargeSpec: CorrectionKindSpec<ChargeRow> = {
  kind: 'charge-session', table: tables.chargeSessions,
  subjects: c => [{ kind: 'battery', id: c.batteryId }],
}

// A finished charge corrected: its amp-hours, end temperature, outcome or equalize. Energy, cost, whether
// it counts as a cycle and the hot flag are worked out again; an open charge is ended, not corrected.
export async function correctChargeSession(actor: Actor, input: WithId<ChargeCorrection>) {
  return correctRecord(actor, chargeSpec, input.id, input, async (tx, original) => {
    if (!original.endedAt) throw codedError(409, 'charge_still_open', 'This charge is still open. Take the battery off charge with the right figures; a charge is corrected once it has ended.')
    const [battery] = await tx.select().from(tables.batteries).where(eq(tables.batteries.id, original.batteryId))
    const [charger] = await tx.select().from(tables.chargers).where(eq(tables.chargers.id, original.chargerId))
    const settings = await batteryRoomSettings(tx, original.siteId)
    const gridKwh = gridEnergyKwh(input.ampHoursReturned, battery!.voltage, charger!.efficiency)
    return {
      values: {
        batteryId: original.batteryId, chargerId: original.chargerId, endedAt: original.endedAt, endedBy: original.endedBy,
        ampHoursReturned: input.ampHoursReturned, endTempF: input.endTempF, equalize: input.equalize, outcome: input.outcome,
        gridKwh, energyCost: energyCost(gridKwh, settings.tariffPerKwh),
        countedCycle: isCountedCycle({ complete: input.outcome === 'complete', ampHoursReturned: input.ampHoursReturned, ratedAh: battery!.capacityAh }),
        ranHot: ranHot(input.endTempF, settings.maxChargeTempF), overrideReason: original.overrideReason,
      },
    }
  })
}

const checkSpec: CorrectionKindSpec<CheckRow> = {
  kind: 'electrolyte-check', table: tables.electrolyteChecks,
  subjects: c => [{ kind: 'battery', id: c.batteryId }],
}

// An electrolyte check corrected: level, water and readings, corrected to the reference temperature the
// original used; its cell readings are stored with the new row.
export async function correctElectrolyteCheck(actor: Actor, input: WithId<ElectrolyteCorrection>) {
  return correctRecord(actor, checkSpec, input.id, input, async (tx, original) => {
    const [battery] = await tx.select().from(tables.batteries).where(eq(tables.batteries.id, original.batteryId))
    // readings left out stay as recorded
    const kept = input.cells ? null : await tx.select().from(tables.cellReadings).where(eq(tables.cellReadings.checkId, original.id))
    const cells = input.cells ?? kept!.map(c => ({ cellNumber: c.cellNumber, specificGravity: c.specificGravity, temperatureF: c.temperatureF }))
    const scope = input.cells ? input.scope ?? null : original.scope
    const cellCount = Number(battery!.cellCount)
    const outside = cells.findIndex(c => c.cellNumber > cellCount)
    if (outside >= 0) throw badField(`cells.${outside}.cellNumber`, 'cell_count', `This battery has ${cellCount} cells.`, { cells: cellCount })
    if (scope === 'every_cell' && cells.length !== cellCount) throw badField('cells', 'cells_missing', `Enter all ${cellCount} cells (${cells.length} entered).`, { cells: cellCount, entered: cells.length })
    const settings = await batteryRoomSettings(tx, original.siteId)
    const temps = { referenceTempF: original.referenceTempF ?? settings.sgReferenceTempF, correctionPerDegF: original.correctionPerDegF ?? settings.sgCorrectionPerDegF }
    const summary = summarizeElectrolyteReadings(cells, temps, settings.cellSpreadThreshold)
    return {
      values: {
        batteryId: original.batteryId, level: input.level, waterAddedGal: input.waterAddedGal, scope: cells.length ? scope : null,
        ...temps, meanCorrectedSg: summary.meanCorrectedSg, spread: scope === 'every_cell' ? summary.spread : null,
        lowCellCount: summary.lowCells.length, stateOfChargePct: summary.stateOfChargePct, afterCharge: original.afterCharge,
      },
      after: async (row) => {
        if (summary.cells.length) await tx.insert(tables.cellReadings).values(summary.cells.map(c => ({ checkId: row.id, ...c })))
      },
    }
  })
}
