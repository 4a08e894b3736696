import { randomUUID } from 'node:crypto'
import type { z } from 'zod'
import type { FitReason } from '#shared/utils/battery-fit'
import { NO_ELECTROLYTE_READING, takesElectrolyteReadings } from '#shared/utils/chemistry-rules'
import {
  WATER_AFTER_CHARGE_CAUTION, justFinishedCharge, summarizeElectrolyteReadings, wateringBeforeChargeCaution, type electrolyteCheckSchema,
} from '#shared/utils/battery-room-schemas'
import type { DbOrTx } from '../db'
import type { Actor } from '../auth'

export type ElectrolyteCheckInput = z.output<typeof electrolyteCheckSchema>
type BatteryRow = typeof tables.batteries.$inferSelect

// An electrolyte check: level, water, and pilot-cell or every-cell readings corrected to the site's
// reference temperature; warns when water goes in before a charge. The battery's status (last SG, spread,
// weak cells, charges since watering) and its watering and every-cell obligations follow from the record.
export async function recordElectrolyteCheck(actor: Actor, battery: BatteryRow, body: ElectrolyteCheckInput) {
  const siteId = battery.siteId
  const ec = tables.electrolyteChecks
  const stored = async (db: DbOrTx) => ownRecord((await db.select().from(ec).where(eq(ec.idempotencyKey, body.idempotencyKey)))[0], actor)
  const replay = await stored(useDb())
  if (replay) return { item: replay, replayed: true, warnings: [] as FitReason[] }
  if (!takesElectrolyteReadings(battery.chemistry)) throw refusal([NO_ELECTROLYTE_READING], { overridable: false, fields: { batteryId: NO_ELECTROLYTE_READING.message } }, 400)
  if (battery.chemistry !== 'flooded_lead_acid') throw badField('batteryId', 'water_flooded_only', 'Only flooded lead-acid batteries take water and hydrometer readings.')
  const cellCount = Number(battery.cellCount)
  const outside = body.cells.findIndex(c => c.cellNumber > cellCount)
  if (outside >= 0) throw badField(`cells.${outside}.cellNumber`, 'cell_count', `This battery has ${cellCount} cells.`, { cells: cellCount })
  if (body.scope === 'every_cell' && body.cells.length !== cellCount) {
    throw badField('cells', 'cells_missing', `Enter all ${cellCount} cells (${body.cells.length} entered).`, { cells: cellCount, entered: body.cells.length })
  }
  const at = eventTime(body.at, 'at')
  const settings = await cachedBatteryRoomSettings(actor, siteId)
  const summary = summarizeElectrolyteReadings(body.cells, { referenceTempF: settings.sgReferenceTempF, correctionPerDegF: settings.sgCorrectionPerDegF }, settings.cellSpreadThreshold)
  try {
    return await useDb().transaction(async (tx) => {
      // In batches on the transaction's connection (see DEVELOPERS.md): the lock with the battery's card,
      // then the check, its cells and the read models' facts (which see them), then the audit row with the
      // read models. The check's id is made here so its cells go in the same batch.
      const [, [before]] = await Promise.all([
        tx.select({ id: tables.batteries.id }).from(tables.batteries).where(eq(tables.batteries.id, battery.id)).for('update').then(rows => rows),
        loadBatteryRows(tx, { siteId, batteryIds: [battery.id] }),
      ])
      const timing = {
        waterAddedGal: body.waterAddedGal,
        chargeOpen: !!before?.chargeSessionId,
        lastChargeEndedAt: dateFromMs(before?.lastChargeEndedMs),
        lastInstalledAt: dateFromMs(before?.lastInstalledMs),
      }
      const warnings: FitReason[] = []
      if (wateringBeforeChargeCaution(timing, at)) warnings.push({ code: 'water_before_charge', message: WATER_AFTER_CHARGE_CAUTION })
      // (once the lock is held: see startChargeSession)
      const ctx = await cachedSiteContext(actor, siteId, tx)
      const checkId = randomUUID()
      const [[check], , models] = await Promise.all([
        tx.insert(ec).values({
          id: checkId, siteId, userId: actor.user.id, at, idempotencyKey: body.idempotencyKey, note: body.note,
          batteryId: battery.id, level: body.level, waterAddedGal: body.waterAddedGal, scope: body.cells.length ? body.scope : null,
          referenceTempF: settings.sgReferenceTempF, correctionPerDegF: settings.sgCorrectionPerDegF,
          meanCorrectedSg: summary.meanCorrectedSg, spread: body.scope === 'every_cell' ? summary.spread : null,
          lowCellCount: summary.lowCells.length, stateOfChargePct: summary.stateOfChargePct,
          afterCharge: justFinishedCharge(timing, at),
        }).returning().then(rows => rows),
        summary.cells.length ? tx.insert(tables.cellReadings).values(summary.cells.map(c => ({ checkId, ...c }))).then(() => undefined) : undefined,
        computeReadModels(tx, ctx, { battery: [battery.id] }),
      ])
      await Promise.all([
        writeAudit(tx, { actor, siteId, action: 'electrolyte_check', entity: 'electrolyte_check', entityId: check!.id, after: { ...check, cells: summary.cells }, note: warnings.map(w => w.message).join(' ') || undefined }),
        writeReadModels(tx, { siteId, subjectIds: [battery.id] }, models),
      ])
      const [after] = await loadBatteryRows(tx, { siteId, batteryIds: [battery.id] })
      return { item: check!, cells: summary.cells, lowCells: summary.lowCells, replayed: false, warnings, status: batteryRoomStatus(after!, settings.timeZone, new Date()) }
    })
  }
  catch (error) {
    if (pgConstraint(error) === 'electrolyte_checks_idem') {
      const again = await stored(useDb())
      if (again) return { item: again, replayed: true, warnings: [] as FitReason[] }
    }
    throw error
  }
}
