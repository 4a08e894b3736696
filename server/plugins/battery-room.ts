import type { BatteryState } from '#shared/utils/battery-state'
import type { StatusTone } from '../utils/asset-status'
import type { HistoryEntry, HistoryWords } from '../utils/asset-history'

const STATE_TONES: Record<BatteryState, StatusTone> = {
  in_truck: 'neutral', on_charge: 'notice', cooling: 'notice', ready: 'safe', needs_charge: 'caution', out_of_service: 'danger',
}
const FLAG_TONES: Record<string, StatusTone> = {
  wateringOverdue: 'warning', weakCell: 'warning', ranHot: 'warning', wateringDue: 'caution', equalizeDue: 'notice',
}
const tenth = (v: number) => Math.round(v * 10) / 10
const overrideWords = (reason: string | null): HistoryWords[] => (reason ? [{ code: 'override', params: { reason } }] : [])
// what a charge's end recorded, in stored units (°F as `end_f`)
const chargeEndWords = (r: typeof tables.chargeSessions.$inferSelect): HistoryWords[] => [
  { code: r.outcome === 'interrupted' ? 'charge_interrupted' : 'charge_complete' },
  ...(r.ampHoursReturned !== null ? [{ code: 'amp_hours', params: { ah: tenth(r.ampHoursReturned) } }] : []),
  ...(r.gridKwh !== null ? [{ code: 'grid_kwh', params: { kwh: tenth(r.gridKwh) } }] : []),
  ...(r.endTempF !== null ? [{ code: 'end_temp', params: { end_f: r.endTempF } }] : []),
  ...(r.packStateOfChargePct !== null ? [{ code: 'pack_charged', params: { percent: tenth(r.packStateOfChargePct) } }] : []),
  ...(r.ranHot ? [{ code: 'ran_hot' }] : []),
]
const swapValues = (w: typeof tables.batterySwaps.$inferSelect) => ({ truckId: w.truckId, batteryOutId: w.batteryOutId, batteryInId: w.batteryInId, hourMeter: w.hourMeter })
const chargeValues = (r: typeof tables.chargeSessions.$inferSelect) => ({ ampHoursReturned: r.ampHoursReturned, endTempF: r.endTempF, outcome: r.outcome, equalize: r.equalize })

// The battery room describes batteries (state and care flags from battery_status and their obligations)
// and electric trucks (the battery they hold), and adds swaps, charges and electrolyte checks to the timelines.
export default defineNitroPlugin(() => {
  // a battery's status and what is due on it, in one statement, or in the tag look-up's own
  registerAssetFacts('battery', 'battery', batteryRowJson)
  registerAssetStatus('battery', async (row) => {
    const facts = factsCameWithAsset<BatteryRow>(row, 'battery') ?? (await loadBatteryRows(useDb(), { siteId: row.siteId, batteryIds: [row.id], withObligations: true }))[0]
    if (!facts) return null
    const due = statusDueItems(subjectObligations(facts.obligations ?? [], { kind: 'battery', id: row.id, label: String(row.serial ?? ''), tagCode: null }))
    const s = batteryRoomStatus(facts, facts.timeZone, new Date())
    const where = s.state === 'in_truck' ? ` · truck ${facts.truckFleetNumber}` : s.state === 'on_charge' ? ` · charger ${facts.chargerName}` : ''
    const cooling = s.state === 'cooling' ? ` · ${s.coolingMinutesLeft} min left` : ''
    return {
      state: s.state,
      label: `${s.label}${where}${cooling}`,
      tone: STATE_TONES[s.state],
      params: stateParams(s.state, facts.truckFleetNumber, facts.chargerName, s.coolingMinutesLeft),
      flags: s.flagList.map(f => ({ key: f.key, label: f.label, tone: FLAG_TONES[f.key] ?? 'caution' })),
      due,
    }
  })

  // the battery an electric truck holds, read with the truck in the tag look-up's statement, or here
  registerAssetFacts('truck', 'battery', table => sql`(SELECT json_build_object('serial', b.serial) FROM battery_status s
    JOIN batteries b ON b.id = s.battery_id WHERE s.truck_id = ${table}.id AND ${table}.power = 'electric' LIMIT 1)`)
  registerAssetStatus('truck', async (row) => {
    if (row.power !== 'electric' || row.outOfService) return null
    const came = factsCameWithAsset<{ serial: string } | null>(row, 'battery')
    const [current] = came !== undefined
      ? (came ? [came] : [])
      : await useDb().select({ serial: tables.batteries.serial }).from(tables.batteryStatus)
          .innerJoin(tables.batteries, eq(tables.batteries.id, tables.batteryStatus.batteryId)).where(eq(tables.batteryStatus.truckId, row.id))
    return current
      ? { state: 'battery_in', flags: [{ key: 'battery', label: `Battery ${current.serial}`, params: { serial: current.serial }, tone: 'neutral' as const }] }
      : { state: 'battery_needed', flags: [{ key: 'battery_none', label: 'No battery recorded', tone: 'caution' as const }] }
  })

  registerHistorySource('battery', async (batteryId, limit) => {
    const db = useDb()
    const s = tables.batterySwaps
    const c = tables.chargeSessions
    const e = tables.electrolyteChecks
    const [swaps, charges, checks] = await Promise.all([
      db.select({ w: s, truck: tables.trucks.fleetNumber, who: tables.users.name })
        .from(s).innerJoin(tables.trucks, eq(tables.trucks.id, s.truckId)).innerJoin(tables.users, eq(tables.users.id, s.userId))
        .where(or(eq(s.batteryInId, batteryId), eq(s.batteryOutId, batteryId))).orderBy(desc(s.at)).limit(limit),
      db.select({ row: c, charger: tables.chargers.name, who: tables.users.name })
        .from(c).innerJoin(tables.chargers, eq(tables.chargers.id, c.chargerId)).innerJoin(tables.users, eq(tables.users.id, c.userId))
        .where(eq(c.batteryId, batteryId)).orderBy(desc(c.at)).limit(limit),
      db.select({ row: e, who: tables.users.name })
        .from(e).innerJoin(tables.users, eq(tables.users.id, e.userId))
        .where(eq(e.batteryId, batteryId)).orderBy(desc(e.at)).limit(limit),
    ])
    const [swapsBy, chargesBy, checksBy] = await Promise.all([
      correctedByOf(s, swaps.map(x => x.w.id)), correctedByOf(c, charges.map(x => x.row.id)), correctedByOf(e, checks.map(x => x.row.id)),
    ])
    const entries: HistoryEntry[] = swaps.map(({ w, truck, who }) => recordEntry({
      id: `swap-${w.id}-${w.batteryInId === batteryId ? 'in' : 'out'}`,
      at: w.at,
      ...historyLine({ code: w.batteryInId === batteryId ? 'put_in_truck' : 'taken_out_of_truck', params: { truck } }, overrideWords(w.overrideReason)),
      who,
      tone: w.overrideReason ? 'warning' : undefined,
    }, 'battery-swap', w, swapsBy, swapValues(w)))
    for (const { row, charger, who } of charges) {
      entries.push({ id: `charge-${row.id}`, at: row.at, ...historyLine({ code: row.equalize ? 'equalize_on' : 'charge_on', params: { charger } }, overrideWords(row.overrideReason)), who })
      if (row.endedAt) entries.push(recordEntry({ id: `charge-end-${row.id}`, at: row.endedAt, ...historyLine({ code: 'off_charger', params: { charger } }, chargeEndWords(row)), who, tone: row.ranHot ? 'warning' : undefined }, 'charge-session', row, chargesBy, chargeValues(row)))
    }
    for (const { row, who } of checks) {
      const words: HistoryWords[] = [
        { code: 'level', params: { level: row.level } },
        ...(row.waterAddedGal > 0 ? [{ code: 'water_added', params: { water_gal: row.waterAddedGal } }] : []),
        ...(row.meanCorrectedSg !== null ? [{ code: 'mean_sg', params: { sg: row.meanCorrectedSg.toFixed(3) } }] : []),
        ...(row.spread !== null ? [{ code: 'sg_spread', params: { spread: row.spread.toFixed(3) } }] : []),
        ...(row.lowCellCount ? [{ code: 'low_cells', params: { n: row.lowCellCount } }] : []),
      ]
      const title = row.scope === 'every_cell' ? 'every_cell_reading' : row.scope === 'pilot_cell' ? 'pilot_cell_reading' : 'level_check'
      entries.push(recordEntry({ id: `check-${row.id}`, at: row.at, ...historyLine({ code: title }, words), who, tone: row.lowCellCount ? 'warning' : undefined }, 'electrolyte-check', row, checksBy, { level: row.level, waterAddedGal: row.waterAddedGal }))
    }
    return entries
  })

  registerHistorySource('truck', async (truckId, limit) => {
    const s = tables.batterySwaps
    const rows = await useDb().select({ r: s, serial: tables.batteries.serial, who: tables.users.name })
      .from(s).innerJoin(tables.batteries, eq(tables.batteries.id, s.batteryInId)).innerJoin(tables.users, eq(tables.users.id, s.userId))
      .where(eq(s.truckId, truckId)).orderBy(desc(s.at)).limit(limit)
    const by = await correctedByOf(s, rows.map(x => x.r.id))
    return rows.map(({ r, serial, who }) => recordEntry({
      id: `swap-${r.id}`, at: r.at, who,
      ...historyLine({ code: 'battery_fitted', params: { battery: serial } }, [...(r.hourMeter !== null ? [{ code: 'hour_meter', params: { hours: tenth(r.hourMeter) } }] : []), ...overrideWords(r.overrideReason)]),
      tone: r.overrideReason ? 'warning' as const : undefined,
    }, 'battery-swap', r, by, swapValues(r)))
  })

  registerHistorySource('charger', async (chargerId, limit) => {
    const c = tables.chargeSessions
    const rows = await useDb().select({ row: c, serial: tables.batteries.serial, who: tables.users.name })
      .from(c).innerJoin(tables.batteries, eq(tables.batteries.id, c.batteryId)).innerJoin(tables.users, eq(tables.users.id, c.userId))
      .where(eq(c.chargerId, chargerId)).orderBy(desc(c.at)).limit(limit)
    const by = await correctedByOf(c, rows.map(x => x.row.id))
    return rows.map(({ row, serial, who }) => {
      const entry: HistoryEntry = {
        id: `charge-${row.id}`, at: row.at, who,
        ...historyLine({ code: 'charged_battery', params: { battery: serial } }, row.endedAt ? chargeEndWords(row).filter(w => ['charge_complete', 'charge_interrupted', 'amp_hours', 'grid_kwh'].includes(w.code)) : [{ code: 'on_charge_now' }]),
      }
      return row.endedAt ? recordEntry(entry, 'charge-session', row, by, chargeValues(row)) : entry
    })
  })
})

/** where a battery is, as values for the reader's words: its truck, its charger, or minutes of cooling left */
function stateParams(state: string, truck: string | null, charger: string | null, minutesLeft: number) {
  if (state === 'in_truck' && truck) return { truck }
  if (state === 'on_charge' && charger) return { charger }
  if (state === 'cooling') return { minutesLeft }
  return undefined
}
