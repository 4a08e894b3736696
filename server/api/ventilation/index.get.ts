import { z } from 'zod'
import { AID_DISCLAIMER } from '#shared/utils/disclaimer'
import { HYDROGEN_LFL_FRACTION, VENTILATION_SCOPE_CAUTION } from '#shared/utils/ventilation'
import { chargingAreaVentilation, type VentCharger } from '#shared/utils/ventilation-check'

const QuerySchema = z.object({
  siteId: z.uuid(),
  areaId: z.uuid(),
  designPercent: z.coerce.number().gt(0).lt(HYDROGEN_LFL_FRACTION * 100, 'Below the 4 % lower flammable limit.').default(1),
  tempF: z.coerce.number().min(-40).max(130).default(77),
})

interface VentRow {
  id: string
  name: string
  chargerType: VentCharger['chargerType']
  gassingCurrentA: number | null
  outputVoltage: number
  maxCapacityAh: number
  chemistryProfiles: string | string[]
  cells: number | null
  capacityAh: number | null
  chemistry: string | null
}

// The ventilation check of a charging area: every in-service charger gassing at once, each with the
// largest battery it charged in the last 90 days (or its rated maximum), against the installed exhaust.
export default defineAbilityHandler('report.view', async (event) => {
  const query = validateQuery(event, QuerySchema)
  await requireAbility(event, 'report.view', query.siteId)
  const db = useDb()
  const area = await areaAtSite(db, query.siteId, query.areaId)
  if (area.kind !== 'charging_area') throw codedError(400, 'ventilation_charging_area', 'The ventilation check is for charging areas.', { fields: { areaId: 'Pick a charging area.' } })
  const rows = await db.execute(sql`
    SELECT ch.id, ch.name, ch.charger_type AS "chargerType", ch.gassing_current_a AS "gassingCurrentA", ch.output_voltage AS "outputVoltage",
      ch.max_capacity_ah AS "maxCapacityAh", ch.chemistry_profiles AS "chemistryProfiles",
      b.cell_count AS "cells", b.capacity_ah AS "capacityAh", b.chemistry
    FROM chargers ch
    LEFT JOIN LATERAL (
      SELECT bb.cell_count, bb.capacity_ah, bb.chemistry FROM charge_sessions c JOIN batteries bb ON bb.id = c.battery_id
      WHERE c.charger_id = ch.id AND c.at > now() - interval '90 days'
      ORDER BY bb.capacity_ah DESC, bb.cell_count DESC LIMIT 1
    ) b ON true
    WHERE ch.area_id = ${area.id} AND ch.site_id = ${query.siteId} AND NOT ch.out_of_service
    ORDER BY ch.name`) as unknown as VentRow[]
  const chargers: VentCharger[] = rows.map((r) => {
    const profiles = Array.isArray(r.chemistryProfiles) ? r.chemistryProfiles : String(r.chemistryProfiles).replace(/[{}]/g, '').split(',')
    const chemistry = r.chemistry ?? (profiles.includes('flooded_lead_acid') ? 'flooded_lead_acid' : profiles[0] ?? 'flooded_lead_acid')
    return {
      id: r.id, name: r.name, chargerType: r.chargerType, gassingCurrentA: r.gassingCurrentA,
      // 2 V nominal per lead-acid cell (common practice) when no battery has been charged on it lately
      cells: r.cells ?? Math.round(r.outputVoltage / 2),
      capacityAh: r.capacityAh ?? r.maxCapacityAh,
      batteryType: chemistry === 'lithium_ion' ? 'lithium' : chemistry === 'flooded_lead_acid' ? 'flooded' : 'vrla',
    }
  })
  const result = chargingAreaVentilation(
    { floorAreaFt2: area.floorAreaFt2, roomVolumeFt3: area.roomVolumeFt3, installedExhaustCfm: area.installedExhaustCfm },
    chargers, query.designPercent / 100, query.tempF,
  )
  return {
    area: { id: area.id, name: area.name, floorAreaFt2: area.floorAreaFt2, roomVolumeFt3: area.roomVolumeFt3, installedExhaustCfm: area.installedExhaustCfm },
    designPercent: query.designPercent,
    tempF: query.tempF,
    ...result,
    caution: VENTILATION_SCOPE_CAUTION,
    disclaimer: AID_DISCLAIMER,
    sources: {
      hydrogen: 'Faraday\'s law: 0.000269 ft³/min per A per cell at 77 °F (IEEE 484 figure)',
      concentration: 'Exhaust Q = H₂ / C at the design concentration (1 % = a quarter of the 4 % lower flammable limit)',
      prescriptive: '1 cfm per ft² of floor area (International Mechanical Code 502.4 as adopted)',
      en62485: 'EN 62485-3: Q = 0.05 × n × I_gas × C_n / 100 m³/h (0.055 in the newer edition); opening A = 28 × Q cm²',
    },
  }
})
