import { eq, sql } from 'drizzle-orm'
import { batteryObligations, batteryStatusFrom, type BatteryFacts } from '../../shared/utils/derived-battery'
import { truckObligations, truckStatusFrom, type TruckFacts } from '../../shared/utils/derived-subjects'
import { effectiveRecords } from '../../shared/utils/effective-records'
import type { CompletionFact } from '../../shared/utils/derived-custom'
import type { ObligationRecord } from '../../shared/utils/due-rules'
import { loadSiteContext } from '../../server/utils/due/site-context'
import { tables, useTestDb } from './db'
import { inspectionFactsFromRecords } from './read-models-inspection'

// The read models of a site as stored (for comparing the incremental ones with a rebuild), and the same
// read models worked out here in TypeScript straight from the site's records — the effective-record rule
// applied to rows in memory, not the SQL facts loaders — and handed to the rule module's pure functions.

const byTime = <T extends { at: Date, recordedAt: Date }>(a: T, b: T) => a.at.getTime() - b.at.getTime() || a.recordedAt.getTime() - b.recordedAt.getTime()
const latest = <T extends { at: Date, recordedAt: Date }>(rows: T[]) => [...rows].sort(byTime).at(-1) ?? null

/** battery_status, truck_status and obligations of a site, comparable as plain values. */
export async function storedReadModels(siteId: string) {
  const db = useTestDb()
  const strip = <T extends Record<string, unknown>>(r: T) => Object.fromEntries(Object.entries(r).filter(([k]) => k !== 'computedAt' && k !== 'id'))
  const [batteries, trucks, obligations] = await Promise.all([
    db.select().from(tables.batteryStatus).where(eq(tables.batteryStatus.siteId, siteId)),
    db.select().from(tables.truckStatus).where(eq(tables.truckStatus.siteId, siteId)),
    db.select().from(tables.obligations).where(eq(tables.obligations.siteId, siteId)),
  ])
  const key = (r: Record<string, unknown>) => String(r.batteryId ?? r.truckId ?? `${r.ruleKey}:${r.subjectId}`)
  const sort = <T extends Record<string, unknown>>(rows: T[]) => rows.map(strip).sort((a, b) => key(a).localeCompare(key(b)))
  return { batteries: sort(batteries), trucks: sort(trucks), obligations: sort(obligations) }
}

/** Battery and truck read models of a site computed in memory from all its records. */
export async function readModelsFromRecords(siteId: string) {
  const db = useTestDb()
  const ctx = await loadSiteContext(db, siteId)
  const [batteries, trucks, swaps, charges, checks, exchanges, tests, completionRows, tags] = await Promise.all([
    db.select().from(tables.batteries).where(eq(tables.batteries.siteId, siteId)),
    db.select().from(tables.trucks).where(eq(tables.trucks.siteId, siteId)),
    db.select().from(tables.batterySwaps).where(eq(tables.batterySwaps.siteId, siteId)),
    db.select().from(tables.chargeSessions).where(eq(tables.chargeSessions.siteId, siteId)),
    db.select().from(tables.electrolyteChecks).where(eq(tables.electrolyteChecks.siteId, siteId)),
    db.select().from(tables.cylinderExchanges).where(eq(tables.cylinderExchanges.siteId, siteId)),
    db.select().from(tables.emissionsTests).where(eq(tables.emissionsTests.siteId, siteId)),
    db.select().from(tables.scheduleCompletions).where(eq(tables.scheduleCompletions.siteId, siteId)),
    db.execute<{ assetId: string, code: string }>(sql`SELECT asset_id AS "assetId", code FROM tags WHERE site_id = ${siteId} AND retired_at IS NULL`),
  ])
  const tagOf = new Map(tags.map(t => [t.assetId, t.code]))
  const s = effectiveRecords(swaps)
  const c = effectiveRecords(charges)
  const e = effectiveRecords(checks)
  const completions: CompletionFact[] = effectiveRecords(completionRows)
    .map(r => ({ scheduleId: r.scheduleId, subjectId: r.subjectId, doneOn: r.doneOn, at: r.at, hourMeter: r.hourMeter }))
  const policy = { coolDownMinutes: ctx.settings.coolDownMinutes, cellSpreadThreshold: ctx.settings.cellSpreadThreshold, maxChargeTempF: ctx.settings.maxChargeTempF }
  const status = []
  const obligations: ObligationRecord[] = []
  for (const b of batteries) {
    const mine = c.filter(x => x.batteryId === b.id)
    const ended = mine.filter(x => x.endedAt)
    const lastIn = latest(s.filter(x => x.batteryInId === b.id))
    const lastOut = latest(s.filter(x => x.batteryOutId === b.id))
    const lastEnded = latest(ended)
    const equalized = latest(ended.filter(x => x.equalize && x.outcome === 'complete'))
    const myChecks = e.filter(x => x.batteryId === b.id)
    const sg = latest(myChecks.filter(x => x.meanCorrectedSg !== null))
    const cell = latest(myChecks.filter(x => x.scope === 'every_cell'))
    const open = latest(mine.filter(x => !x.endedAt))
    const facts: BatteryFacts = {
      id: b.id, siteId, serial: b.serial, tagCode: tagOf.get(b.id) ?? null, homeAreaId: b.homeAreaId, chemistry: b.chemistry,
      outOfService: b.outOfService, createdAt: b.createdAt, inServiceOn: b.inServiceOn, heldAt: null,
      openCharge: open ? { id: open.id, at: open.at, chargerId: open.chargerId } : null,
      lastEndedCharge: lastEnded ? { endedAt: lastEnded.endedAt!, outcome: lastEnded.outcome, endTempF: lastEnded.endTempF } : null,
      cycles: mine.filter(x => x.countedCycle).length,
      lastIn: lastIn ? { at: lastIn.at, truckId: lastIn.truckId } : null,
      lastOut: lastOut?.at ?? null,
      displaced: !!lastIn && s.some(x => x.truckId === lastIn.truckId && x.batteryInId !== b.id && byTime(x, lastIn) > 0),
      lastWateredAt: latest(myChecks.filter(x => x.waterAddedGal > 0))?.at ?? null,
      lastEqualizedAt: equalized?.endedAt ?? null,
      chargeEnds: ended.map(x => x.endedAt!).sort((a, z) => a.getTime() - z.getTime()),
      lastSg: sg ? { at: sg.at, meanCorrectedSg: sg.meanCorrectedSg!, stateOfChargePct: sg.stateOfChargePct } : null,
      lastCellCheck: cell ? { at: cell.at, spread: cell.spread, lowCellCount: cell.lowCellCount } : null,
      completions: completions.filter(x => x.subjectId === b.id),
    }
    status.push(batteryStatusFrom(facts, policy))
    obligations.push(...batteryObligations(facts, ctx.schedules, ctx.timeZone))
  }
  const truckStatus = []
  const inspectionsOf = await inspectionFactsFromRecords(siteId)
  for (const t of trucks) {
    const { readings: inspected, ...inspection } = inspectionsOf(t.id)
    const readings = [
      ...inspected,
      ...s.filter(x => x.truckId === t.id && x.hourMeter !== null),
      ...effectiveRecords(exchanges).filter(x => x.truckId === t.id && x.hourMeter !== null),
      ...effectiveRecords(completionRows).filter(x => x.subjectId === t.id && x.hourMeter !== null),
    ].sort(byTime).map(x => ({ at: x.at, hours: x.hourMeter! }))
    const test = effectiveRecords(tests).filter(x => x.truckId === t.id)
      .sort((a, z) => z.testedOn.localeCompare(a.testedOn) || z.recordedAt.getTime() - a.recordedAt.getTime())[0]
    const facts: TruckFacts = {
      id: t.id, siteId, fleetNumber: t.fleetNumber, tagCode: tagOf.get(t.id) ?? null, homeAreaId: t.homeAreaId, power: t.power,
      outOfService: t.outOfService, createdAt: t.createdAt, registeredHours: t.hourMeter, readings,
      lastEmissions: test ? { testedOn: test.testedOn, passed: test.passed } : null, completions: completions.filter(x => x.subjectId === t.id),
      ...inspection,
    }
    truckStatus.push(truckStatusFrom(facts))
    obligations.push(...truckObligations(facts, ctx.schedules, ctx.timeZone))
  }
  return { status, truckStatus, obligations }
}
