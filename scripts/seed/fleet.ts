import { batteryTruckFit, chargerBatteryMatch, type BatteryChemistry, type BatterySpec, type TruckBatterySpec } from '../../shared/utils/battery-fit'
import { cellCountForNominalVoltage } from '../../shared/utils/specific-gravity'
import { addCalendarInterval } from '../../shared/utils/due-dates'
import type { SeedContext, SiteKey } from './context'
import type { AreaRow, BatteryRow, ChargerRow, TruckRow } from './rows'

export type GroupKey = 'g48' | 'li48' | 'g80' | 'g36' | 'g24'

interface GroupSpec {
  voltage: number
  chemistry: BatteryChemistry
  connector: string
  /** Battery case, in: length × width × height. */
  size: [number, number, number]
  /** Rated Ah at the 6-hour rate against weight, lb. */
  builds: Record<number, number>
  compartment: [number, number, number]
  minLb: number
  maxLb: number
  chargingArea: Record<SiteKey, string>
}

const GROUPS: Record<GroupKey, GroupSpec> = {
  g48: { voltage: 48, chemistry: 'flooded_lead_acid', connector: '320 A blue', size: [38.4, 20.6, 30.7], builds: { 765: 2190, 850: 2380, 930: 2540 }, compartment: [38.9, 20.9, 31.2], minLb: 2050, maxLb: 2650, chargingArea: { mb: 'North charge room', fx: 'Charge bay' } },
  li48: { voltage: 48, chemistry: 'lithium_ion', connector: '320 A blue', size: [38.4, 20.6, 30.4], builds: { 630: 2280 }, compartment: [38.9, 20.9, 31.2], minLb: 2050, maxLb: 2650, chargingArea: { mb: 'North charge room', fx: 'Charge bay' } },
  g80: { voltage: 80, chemistry: 'flooded_lead_acid', connector: '350 A yellow', size: [39.9, 38.4, 30.9], builds: { 595: 3150, 680: 3560, 765: 3880, 850: 4140 }, compartment: [40.4, 38.9, 31.3], minLb: 3400, maxLb: 4300, chargingArea: { mb: 'North charge room', fx: 'Charge bay' } },
  g36: { voltage: 36, chemistry: 'flooded_lead_acid', connector: '350 A grey', size: [38.2, 16.1, 31.0], builds: { 765: 1650, 850: 1800, 930: 1950 }, compartment: [38.7, 16.5, 31.5], minLb: 1550, maxLb: 2100, chargingArea: { mb: 'South charge room', fx: 'Charge bay' } },
  g24: { voltage: 24, chemistry: 'flooded_lead_acid', connector: '175 A red', size: [31.0, 13.3, 30.5], builds: { 510: 890, 595: 1010 }, compartment: [31.4, 13.6, 31.0], minLb: 800, maxLb: 1150, chargingArea: { mb: 'South charge room', fx: 'Charge bay' } },
}

interface TruckPlan {
  site: SiteKey
  fleet: string
  truckClass: number
  power: 'electric' | 'lp_gas' | 'gasoline'
  model: string
  group?: 'g48' | 'g80' | 'g36' | 'g24'
  allowsLithium?: boolean
  /** Hours before the seed runs that the truck last had its battery changed: sets what the bay board shows now. */
  hoursSinceSwap?: number
  /** Capacity of the two batteries the truck alternates between. */
  pairAh?: number
  usesLithiumPair?: boolean
}

const CB48 = 'Electric counterbalanced, 5,000 lb, 48 V'
const CB80 = 'Electric counterbalanced, 8,000 lb, 80 V'
const REACH = 'Narrow-aisle reach truck, 4,500 lb, 36 V'
const PALLET = 'Rider pallet truck, 6,000 lb, 24 V'
const LP_CUSHION = 'LP-gas counterbalanced, cushion tyres, 5,000 lb'
const LP_PNEUMATIC = 'LP-gas counterbalanced, pneumatic tyres, 6,000 lb'

// On charge now: swapped 2–7 h ago. Cooling: 10–15 h. Ready: 18 h or more. MB-09 was changed a few minutes ago.
const TRUCKS: TruckPlan[] = [
  { site: 'mb', fleet: 'MB-01', truckClass: 1, power: 'electric', model: CB48, group: 'g48', allowsLithium: true, hoursSinceSwap: 3, pairAh: 850 },
  { site: 'mb', fleet: 'MB-02', truckClass: 1, power: 'electric', model: CB48, group: 'g48', allowsLithium: true, hoursSinceSwap: 10, usesLithiumPair: true },
  { site: 'mb', fleet: 'MB-03', truckClass: 1, power: 'electric', model: CB48, group: 'g48', hoursSinceSwap: 11, pairAh: 850 },
  { site: 'mb', fleet: 'MB-04', truckClass: 1, power: 'electric', model: CB48, group: 'g48', hoursSinceSwap: 19, pairAh: 765 },
  { site: 'mb', fleet: 'MB-05', truckClass: 1, power: 'electric', model: CB48, group: 'g48', hoursSinceSwap: 6, pairAh: 930 },
  { site: 'mb', fleet: 'MB-06', truckClass: 1, power: 'electric', model: CB80, group: 'g80', hoursSinceSwap: 5, pairAh: 765 },
  { site: 'mb', fleet: 'MB-07', truckClass: 1, power: 'electric', model: CB80, group: 'g80', hoursSinceSwap: 21, pairAh: 765 },
  { site: 'mb', fleet: 'MB-08', truckClass: 1, power: 'electric', model: CB80, group: 'g80', hoursSinceSwap: 14, pairAh: 680 },
  { site: 'mb', fleet: 'MB-09', truckClass: 2, power: 'electric', model: REACH, group: 'g36', hoursSinceSwap: 0.25, pairAh: 930 },
  { site: 'mb', fleet: 'MB-10', truckClass: 2, power: 'electric', model: REACH, group: 'g36', hoursSinceSwap: 6.25, pairAh: 930 },
  { site: 'mb', fleet: 'MB-11', truckClass: 2, power: 'electric', model: REACH, group: 'g36', hoursSinceSwap: 12.25, pairAh: 850 },
  { site: 'mb', fleet: 'MB-12', truckClass: 2, power: 'electric', model: REACH, group: 'g36', hoursSinceSwap: 18.25, pairAh: 850 },
  { site: 'mb', fleet: 'MB-13', truckClass: 3, power: 'electric', model: PALLET, group: 'g24', hoursSinceSwap: 4, pairAh: 510 },
  { site: 'mb', fleet: 'MB-14', truckClass: 3, power: 'electric', model: PALLET, group: 'g24', hoursSinceSwap: 18, pairAh: 595 },
  { site: 'mb', fleet: 'MB-15', truckClass: 4, power: 'lp_gas', model: LP_CUSHION },
  { site: 'mb', fleet: 'MB-16', truckClass: 4, power: 'lp_gas', model: LP_CUSHION },
  { site: 'mb', fleet: 'MB-17', truckClass: 5, power: 'lp_gas', model: LP_PNEUMATIC },
  { site: 'mb', fleet: 'MB-18', truckClass: 4, power: 'lp_gas', model: LP_CUSHION },
  { site: 'mb', fleet: 'MB-19', truckClass: 5, power: 'lp_gas', model: LP_PNEUMATIC },
  { site: 'mb', fleet: 'MB-20', truckClass: 5, power: 'gasoline', model: 'Gasoline counterbalanced, pneumatic tyres, 6,000 lb (yard)' },
  { site: 'fx', fleet: 'FX-01', truckClass: 1, power: 'electric', model: CB48, group: 'g48', allowsLithium: true, hoursSinceSwap: 2.5, pairAh: 850 },
  { site: 'fx', fleet: 'FX-02', truckClass: 1, power: 'electric', model: CB48, group: 'g48', hoursSinceSwap: 10, pairAh: 850 },
  { site: 'fx', fleet: 'FX-03', truckClass: 1, power: 'electric', model: CB48, group: 'g48', hoursSinceSwap: 20, pairAh: 765 },
  { site: 'fx', fleet: 'FX-04', truckClass: 1, power: 'electric', model: CB80, group: 'g80', hoursSinceSwap: 15, pairAh: 765 },
  { site: 'fx', fleet: 'FX-05', truckClass: 2, power: 'electric', model: REACH, group: 'g36', hoursSinceSwap: 5, pairAh: 850 },
  { site: 'fx', fleet: 'FX-06', truckClass: 2, power: 'electric', model: REACH, group: 'g36', hoursSinceSwap: 19, pairAh: 930 },
  { site: 'fx', fleet: 'FX-07', truckClass: 3, power: 'electric', model: PALLET, group: 'g24', hoursSinceSwap: 23, pairAh: 510 },
  { site: 'fx', fleet: 'FX-08', truckClass: 4, power: 'lp_gas', model: LP_CUSHION },
  { site: 'fx', fleet: 'FX-09', truckClass: 5, power: 'lp_gas', model: LP_PNEUMATIC },
  { site: 'fx', fleet: 'FX-10', truckClass: 4, power: 'lp_gas', model: LP_CUSHION },
]

export type SpareRole = 'ready' | 'light' | 'out_of_service' | 'watering_overdue' | 'needs_charge'

interface SparePlan {
  site: SiteKey
  group: GroupKey
  ah: number
  role: SpareRole
  reason?: string
  heldDaysAgo?: number
  /** Needs charge: the truck it was fitted to and how many days before it came out without a charge. */
  forcedTruck?: string
  forcedDaysAgo?: number
  notes?: string
}

const SPARES: SparePlan[] = [
  { site: 'mb', group: 'g48', ah: 850, role: 'ready' },
  { site: 'mb', group: 'g48', ah: 850, role: 'needs_charge', forcedTruck: 'MB-04', forcedDaysAgo: 3 },
  { site: 'mb', group: 'g48', ah: 930, role: 'ready' },
  { site: 'mb', group: 'g80', ah: 765, role: 'ready' },
  { site: 'mb', group: 'g80', ah: 595, role: 'light', notes: 'Transferred from a retired 80 V truck; lighter build than the current 80 V nameplates allow.' },
  { site: 'mb', group: 'g36', ah: 850, role: 'ready' },
  { site: 'mb', group: 'g36', ah: 765, role: 'out_of_service', reason: 'Cell 7 jar cracked; electrolyte weeping at the cover. Awaiting cell replacement.', heldDaysAgo: 12 },
  { site: 'mb', group: 'g36', ah: 850, role: 'needs_charge', forcedTruck: 'MB-12', forcedDaysAgo: 4 },
  { site: 'mb', group: 'g24', ah: 510, role: 'ready' },
  { site: 'mb', group: 'g24', ah: 595, role: 'ready' },
  { site: 'fx', group: 'g48', ah: 850, role: 'ready' },
  { site: 'fx', group: 'g48', ah: 765, role: 'out_of_service', reason: 'Capacity test gave 68 % of rating; replacement quote requested.', heldDaysAgo: 41 },
  { site: 'fx', group: 'g48', ah: 850, role: 'watering_overdue' },
  { site: 'fx', group: 'g80', ah: 765, role: 'ready' },
  { site: 'fx', group: 'g36', ah: 850, role: 'ready' },
  { site: 'fx', group: 'g36', ah: 930, role: 'ready' },
  { site: 'fx', group: 'g24', ah: 510, role: 'ready' },
  { site: 'fx', group: 'g24', ah: 510, role: 'needs_charge', forcedTruck: 'FX-07', forcedDaysAgo: 2 },
]

interface ChargerPlan {
  site: SiteKey
  area: string
  name: string
  type: 'iu' | 'iui' | 'taper' | 'lithium'
  voltage: number
  minAh: number
  maxAh: number
  lithium?: boolean
  efficiency: number
}

const CHARGERS: ChargerPlan[] = [
  { site: 'mb', area: 'North charge room', name: 'North 48 V no. 1', type: 'iu', voltage: 48, minAh: 700, maxAh: 1000, efficiency: 0.88 },
  { site: 'mb', area: 'North charge room', name: 'North 48 V no. 2', type: 'iu', voltage: 48, minAh: 700, maxAh: 1000, efficiency: 0.87 },
  { site: 'mb', area: 'North charge room', name: 'North 48 V no. 3', type: 'iui', voltage: 48, minAh: 700, maxAh: 1000, efficiency: 0.89 },
  { site: 'mb', area: 'North charge room', name: 'North 48 V lithium-ion', type: 'lithium', voltage: 48, minAh: 500, maxAh: 800, lithium: true, efficiency: 0.9 },
  { site: 'mb', area: 'North charge room', name: 'North 80 V no. 1', type: 'iu', voltage: 80, minAh: 550, maxAh: 900, efficiency: 0.88 },
  { site: 'mb', area: 'North charge room', name: 'North 80 V no. 2', type: 'iu', voltage: 80, minAh: 550, maxAh: 900, efficiency: 0.86 },
  { site: 'mb', area: 'South charge room', name: 'South 36 V no. 1', type: 'taper', voltage: 36, minAh: 700, maxAh: 1000, efficiency: 0.82 },
  { site: 'mb', area: 'South charge room', name: 'South 36 V no. 2', type: 'iui', voltage: 36, minAh: 700, maxAh: 1000, efficiency: 0.89 },
  { site: 'mb', area: 'South charge room', name: 'South 36 V no. 3', type: 'taper', voltage: 36, minAh: 700, maxAh: 1000, efficiency: 0.81 },
  { site: 'mb', area: 'South charge room', name: 'South 24 V no. 1', type: 'taper', voltage: 24, minAh: 450, maxAh: 650, efficiency: 0.8 },
  { site: 'fx', area: 'Charge bay', name: 'Bay 48 V no. 1', type: 'iui', voltage: 48, minAh: 700, maxAh: 1000, efficiency: 0.89 },
  { site: 'fx', area: 'Charge bay', name: 'Bay 48 V no. 2', type: 'iu', voltage: 48, minAh: 700, maxAh: 1000, efficiency: 0.87 },
  { site: 'fx', area: 'Charge bay', name: 'Bay 80 V', type: 'iu', voltage: 80, minAh: 550, maxAh: 900, efficiency: 0.88 },
  { site: 'fx', area: 'Charge bay', name: 'Bay 36 V', type: 'taper', voltage: 36, minAh: 700, maxAh: 1000, efficiency: 0.83 },
  { site: 'fx', area: 'Charge bay', name: 'Bay 24 V', type: 'taper', voltage: 24, minAh: 450, maxAh: 650, efficiency: 0.82 },
]

// Gassing current per 100 Ah of the largest battery the charger takes (EN 62485-3 figures for flooded cells).
const GASSING_A_PER_100AH: Record<ChargerPlan['type'], number | null> = { iu: 2, iui: 4, taper: 5, lithium: null }

export interface ElectricTruck {
  truck: TruckRow
  group: GroupKey
  hoursSinceSwap: number
  pair: [BatteryRow, BatteryRow]
  hoursPerDay: number
}

export interface PlannedBattery {
  row: BatteryRow
  group: GroupKey
  role: 'pair' | SpareRole
  plan?: SparePlan
  pilotCell: number
}

export interface Fleet {
  trucks: TruckRow[]
  electric: ElectricTruck[]
  combustion: TruckRow[]
  batteries: PlannedBattery[]
  chargers: ChargerRow[]
}

export function truckSpec(truck: TruckRow): TruckBatterySpec {
  return {
    systemVoltage: truck.systemVoltage ?? 0,
    connector: truck.connector ?? '',
    allowedChemistries: truck.allowedChemistries ?? [],
    compartmentLengthIn: truck.compartmentLengthIn ?? 0,
    compartmentWidthIn: truck.compartmentWidthIn ?? 0,
    compartmentHeightIn: truck.compartmentHeightIn ?? 0,
    minBatteryWeightLb: truck.minBatteryWeightLb ?? 0,
    maxBatteryWeightLb: truck.maxBatteryWeightLb ?? 0,
  }
}

export function batterySpec(b: BatteryRow): BatterySpec {
  return { voltage: b.voltage, cellCount: b.cellCount, chemistry: b.chemistry, connector: b.connector, lengthIn: b.lengthIn, widthIn: b.widthIn, heightIn: b.heightIn, weightLb: b.weightLb, capacityAh: b.capacityAh }
}

export function buildFleet(ctx: SeedContext): Fleet {
  const { rand, newId, clock } = ctx
  const area = (site: SiteKey, name: string): AreaRow => {
    const found = ctx.sites[site].chargingAreas.find(a => a.name === name)
    if (!found) throw new Error(`no charging area ${name}`)
    return found
  }
  const trucks: TruckRow[] = []
  const electric: ElectricTruck[] = []
  const combustion: TruckRow[] = []
  const batteries: PlannedBattery[] = []
  const serialCount: Record<SiteKey, number> = { mb: 0, fx: 0 }

  const makeBattery = (site: SiteKey, group: GroupKey, ah: number, role: PlannedBattery['role'], plan?: SparePlan): PlannedBattery => {
    const spec = GROUPS[group]
    const weight = spec.builds[ah]
    if (weight === undefined) throw new Error(`no ${group} build of ${ah} Ah`)
    const cells = cellCountForNominalVoltage(spec.voltage, spec.chemistry)
    if (cells === null) throw new Error(`${spec.voltage} V is not a whole number of cells`)
    serialCount[site] += 1
    const inServiceOn = clock.dateDaysAgo(rand.int(380, 470))
    // a few reconditioned lead-acid units, rated for fewer cycles from their return to service, so the
    // replacement forecast has batteries coming due (invented figures)
    const reconditioned = role === 'pair' && spec.chemistry === 'flooded_lead_acid' && serialCount[site] % 8 === 3
    const row: BatteryRow = {
      id: newId(),
      siteId: ctx.sites[site].id,
      serial: `QB${spec.voltage}${site === 'mb' ? 'M' : 'F'}-${String(1000 + serialCount[site] * 7).padStart(4, '0')}`,
      homeAreaId: area(site, spec.chargingArea[site]).id,
      chemistry: spec.chemistry,
      voltage: spec.voltage,
      cellCount: cells,
      capacityAh: ah,
      capacityHourRate: 6,
      weightLb: weight + rand.int(-25, 25),
      lengthIn: spec.size[0],
      widthIn: spec.size[1],
      heightIn: group === 'g80' && ah === 595 ? 28.6 : spec.size[2],
      connector: spec.connector,
      manufacturedOn: addCalendarInterval(inServiceOn, -rand.int(30, 120), 'day'),
      inServiceOn,
      ratedCycles: reconditioned ? 200 + 40 * (serialCount[site] % 3) : 1500,
      // an invented price, about 0.16 per watt-hour of rated capacity, rounded to tens
      replacementPrice: Math.round((spec.voltage * ah * 0.16) / 10) * 10,
      notes: plan?.notes ?? (reconditioned ? 'Reconditioned unit: rated cycles count from its return to service.' : ''),
      createdAt: ctx.registeredAt,
      updatedAt: ctx.registeredAt,
    }
    const planned: PlannedBattery = { row, group, role, plan, pilotCell: Math.max(1, Math.round(cells / 2) - rand.int(0, 2)) }
    batteries.push(planned)
    return planned
  }

  for (const plan of TRUCKS) {
    const spec = plan.group ? GROUPS[plan.group] : null
    const hourMeter = plan.power === 'electric' ? rand.int(4000, 14000) : rand.int(6000, 16000)
    const row: TruckRow = {
      id: newId(),
      siteId: ctx.sites[plan.site].id,
      fleetNumber: plan.fleet,
      truckClass: plan.truckClass,
      power: plan.power,
      model: plan.model,
      homeAreaId: spec ? area(plan.site, spec.chargingArea[plan.site]).id : ctx.sites[plan.site].fuelStation.id,
      systemVoltage: spec?.voltage ?? null,
      compartmentLengthIn: spec?.compartment[0] ?? null,
      compartmentWidthIn: spec?.compartment[1] ?? null,
      compartmentHeightIn: spec?.compartment[2] ?? null,
      minBatteryWeightLb: spec?.minLb ?? null,
      maxBatteryWeightLb: spec?.maxLb ?? null,
      connector: spec?.connector ?? null,
      allowedChemistries: spec ? (plan.allowsLithium ? ['flooded_lead_acid', 'lithium_ion'] : ['flooded_lead_acid']) : [],
      hourMeter,
      createdAt: ctx.registeredAt,
      updatedAt: ctx.registeredAt,
    }
    trucks.push(row)
    if (!plan.group || plan.hoursSinceSwap === undefined) {
      combustion.push(row)
      continue
    }
    const pairGroup: GroupKey = plan.usesLithiumPair ? 'li48' : plan.group
    const pairAh = plan.usesLithiumPair ? 630 : plan.pairAh!
    const pair: [BatteryRow, BatteryRow] = [
      makeBattery(plan.site, pairGroup, pairAh, 'pair').row,
      makeBattery(plan.site, pairGroup, pairAh, 'pair').row,
    ]
    for (const b of pair) {
      const reasons = batteryTruckFit(truckSpec(row), batterySpec(b))
      if (reasons.length > 0) throw new Error(`${b.serial} does not fit ${plan.fleet}: ${reasons.map(r => r.code).join(', ')}`)
    }
    electric.push({ truck: row, group: pairGroup, hoursSinceSwap: plan.hoursSinceSwap, pair, hoursPerDay: rand.between(9, 15) })
  }

  for (const plan of SPARES) makeBattery(plan.site, plan.group, plan.ah, plan.role, plan)

  const chargers: ChargerRow[] = CHARGERS.map((plan, i) => {
    const rate = GASSING_A_PER_100AH[plan.type]
    return {
      id: newId(),
      siteId: ctx.sites[plan.site].id,
      name: plan.name,
      serial: `QC-${plan.site.toUpperCase()}-${String(3100 + i * 13)}`,
      areaId: area(plan.site, plan.area).id,
      chargerType: plan.type,
      outputVoltage: plan.voltage,
      maxCurrentA: Math.round(plan.maxAh * 0.17 / 5) * 5,
      minCapacityAh: plan.minAh,
      maxCapacityAh: plan.maxAh,
      chemistryProfiles: plan.lithium ? ['lithium_ion'] : ['flooded_lead_acid'],
      efficiency: plan.efficiency,
      gassingCurrentA: rate === null ? null : rate * plan.maxAh / 100,
      createdAt: ctx.registeredAt,
      updatedAt: ctx.registeredAt,
    }
  })

  // Every battery must have a charger it matches in its home area.
  for (const b of batteries) {
    const match = chargers.some(c => c.areaId === b.row.homeAreaId && chargerBatteryMatch(chargerSpec(c), batterySpec(b.row)).length === 0)
    if (!match) throw new Error(`no charger in its home area matches ${b.row.serial}`)
  }
  return { trucks, electric, combustion, batteries, chargers }
}

export function chargerSpec(c: ChargerRow) {
  return { outputVoltage: c.outputVoltage, chemistryProfiles: c.chemistryProfiles, minCapacityAh: c.minCapacityAh, maxCapacityAh: c.maxCapacityAh, maxCurrentA: c.maxCurrentA }
}
