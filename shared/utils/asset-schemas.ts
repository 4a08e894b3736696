import { z } from 'zod'
import { isoDateSchema } from './iso-date'

// Payloads for the asset registry, shared by the forms and the routes. Measurements are in the
// canonical US customary units (lb, in, ft², ft³, cfm); forms convert metric input before sending.

export const BATTERY_CHEMISTRIES = ['flooded_lead_acid', 'agm', 'gel', 'lithium_ion'] as const
export const TRUCK_POWERS = ['electric', 'lp_gas', 'gasoline', 'diesel'] as const
export const CHARGER_TYPES = ['iu', 'iui', 'taper', 'lithium'] as const
export const CYLINDER_SPECS = ['dot_4bw', 'dot_4e', 'tc_4bwm', 'tc_4em'] as const
export const CYLINDER_STATUSES = ['full', 'empty', 'in_use', 'quarantined', 'condemned'] as const
export const REQUAL_METHODS = ['water_jacket', 'proof_pressure', 'external_visual'] as const
export const AREA_KINDS = ['charging_area', 'fuel_station'] as const
export const ASSET_KINDS = ['battery', 'charger', 'cylinder', 'truck', 'area'] as const
export type AssetKind = typeof ASSET_KINDS[number]

export const CHEMISTRY_LABELS: Record<typeof BATTERY_CHEMISTRIES[number], string> = {
  flooded_lead_acid: 'Flooded lead-acid', agm: 'AGM', gel: 'Gel', lithium_ion: 'Lithium-ion',
}
export const POWER_LABELS: Record<typeof TRUCK_POWERS[number], string> = {
  electric: 'Electric', lp_gas: 'LP-gas', gasoline: 'Gasoline', diesel: 'Diesel',
}
export const CHARGER_TYPE_LABELS: Record<typeof CHARGER_TYPES[number], string> = {
  iu: 'IU (constant current, constant voltage)', iui: 'IUI (with finishing current)', taper: 'Taper (W)', lithium: 'Lithium-ion profile',
}
export const CYLINDER_SPEC_LABELS: Record<typeof CYLINDER_SPECS[number], string> = {
  dot_4bw: 'DOT-4BW (welded steel)', dot_4e: 'DOT-4E (welded aluminium)', tc_4bwm: 'TC-4BWM', tc_4em: 'TC-4EM',
}
export const CYLINDER_STATUS_LABELS: Record<typeof CYLINDER_STATUSES[number], string> = {
  full: 'Full', empty: 'Empty', in_use: 'In use', quarantined: 'Quarantined', condemned: 'Condemned',
}
export const REQUAL_METHOD_LABELS: Record<typeof REQUAL_METHODS[number], string> = {
  water_jacket: 'Water jacket', proof_pressure: 'Proof pressure', external_visual: 'External visual',
}
export const AREA_KIND_LABELS: Record<typeof AREA_KINDS[number], string> = {
  charging_area: 'Charging area', fuel_station: 'Fuel station',
}
export const TRUCK_CLASS_LABELS: Record<number, string> = {
  1: 'Class 1 — electric rider', 2: 'Class 2 — electric narrow aisle', 3: 'Class 3 — electric hand / pallet',
  4: 'Class 4 — engine, cushion tyres', 5: 'Class 5 — engine, pneumatic tyres', 6: 'Class 6 — tractor', 7: 'Class 7 — rough terrain',
}

const text = (max: number, label: string) => z.string({ error: `${label} is required.` }).trim().min(1, `${label} is required.`).max(max, `${label} is at most ${max} characters.`)
const optionalText = (max: number) => z.string().trim().max(max, `At most ${max} characters.`).default('')
const positive = (label: string, max: number) => z.number({ error: `${label} must be a number.` }).positive(`${label} must be above 0.`).max(max, `${label} above ${max} looks wrong.`)
const optionalPositive = (label: string, max: number) => positive(label, max).nullable().default(null)
const isoDate = isoDateSchema
const uuidRef = z.uuid('Pick one from the list.')

export const truckFields = z.object({
  fleetNumber: text(40, 'Fleet number'),
  truckClass: z.number({ error: 'Pick a truck class.' }).int().min(1, 'Class 1 to 7.').max(7, 'Class 1 to 7.'),
  power: z.enum(TRUCK_POWERS, { error: 'Pick the power source.' }),
  model: optionalText(80),
  homeAreaId: uuidRef.nullable().default(null),
  systemVoltage: z.number({ error: 'System voltage must be a number.' }).int('Whole volts.').min(12, 'At least 12 V.').max(120, 'At most 120 V.').nullable().default(null),
  compartmentLengthIn: optionalPositive('Compartment length', 200),
  compartmentWidthIn: optionalPositive('Compartment width', 200),
  compartmentHeightIn: optionalPositive('Compartment height', 200),
  minBatteryWeightLb: optionalPositive('Minimum battery weight', 20000),
  maxBatteryWeightLb: optionalPositive('Maximum battery weight', 20000),
  connector: optionalText(40).nullable(),
  allowedChemistries: z.array(z.enum(BATTERY_CHEMISTRIES)).max(4).default([]),
  hourMeter: z.number({ error: 'Hour meter must be a number.' }).min(0, 'Not below 0.').max(200000).default(0),
  notes: optionalText(2000),
})

// An electric truck needs its battery nameplate data, or no battery can be checked against it.
export const truckCreateSchema = truckFields.superRefine((t, ctx) => {
  if (t.power === 'electric') {
    for (const key of ['systemVoltage', 'minBatteryWeightLb', 'maxBatteryWeightLb'] as const) {
      if (t[key] == null) ctx.addIssue({ code: 'custom', path: [key], message: 'Needed for an electric truck (from its nameplate).' })
    }
    if (t.allowedChemistries.length === 0) ctx.addIssue({ code: 'custom', path: ['allowedChemistries'], message: 'Pick at least one battery chemistry.' })
    if (t.truckClass > 3) ctx.addIssue({ code: 'custom', path: ['truckClass'], message: 'Electric trucks are class 1, 2 or 3.' })
  }
  if (t.minBatteryWeightLb != null && t.maxBatteryWeightLb != null && t.minBatteryWeightLb > t.maxBatteryWeightLb) {
    ctx.addIssue({ code: 'custom', path: ['maxBatteryWeightLb'], message: 'Maximum must be at least the minimum.' })
  }
})

export const batteryFields = z.object({
  serial: text(60, 'Serial'),
  homeAreaId: uuidRef.nullable().default(null),
  chemistry: z.enum(BATTERY_CHEMISTRIES, { error: 'Pick the chemistry.' }),
  voltage: z.number({ error: 'Voltage must be a number.' }).int('Whole volts.').min(12, 'At least 12 V.').max(120, 'At most 120 V.'),
  cellCount: z.number({ error: 'Cell count must be a number.' }).int('Whole cells.').min(1).max(60),
  capacityAh: z.number({ error: 'Capacity must be a number.' }).int('Whole amp-hours.').min(20, 'At least 20 Ah.').max(3000, 'At most 3,000 Ah.'),
  capacityHourRate: z.number().int().min(1).max(20).default(6),
  weightLb: positive('Weight', 20000),
  lengthIn: positive('Length', 200),
  widthIn: positive('Width', 200),
  heightIn: positive('Height', 200),
  connector: text(40, 'Connector'),
  manufacturedOn: isoDate.nullable().default(null),
  inServiceOn: isoDate.nullable().default(null),
  ratedCycles: z.number().int().min(100).max(10000).default(1500),
  replacementPrice: z.number({ error: 'Price must be a number.' }).min(0, 'Not below zero.').max(1_000_000, 'At most 1,000,000.').nullable().default(null),
  notes: optionalText(2000),
})
export const batteryCreateSchema = batteryFields.superRefine((b, ctx) => {
  if (b.chemistry !== 'lithium_ion' && b.cellCount * 2 !== b.voltage) {
    ctx.addIssue({ code: 'custom', path: ['cellCount'], message: `A ${b.voltage} V lead-acid battery has ${b.voltage / 2} cells (2 V each).` })
  }
  if (b.manufacturedOn && b.inServiceOn && b.inServiceOn < b.manufacturedOn) {
    ctx.addIssue({ code: 'custom', path: ['inServiceOn'], message: 'In service before it was made?' })
  }
})

export const chargerFields = z.object({
  name: text(60, 'Name'),
  serial: optionalText(60),
  areaId: uuidRef,
  chargerType: z.enum(CHARGER_TYPES, { error: 'Pick the charger type.' }),
  outputVoltage: z.number({ error: 'Output voltage must be a number.' }).int().min(12).max(120),
  maxCurrentA: positive('Maximum current', 2000),
  minCapacityAh: z.number().int().min(1).max(3000),
  maxCapacityAh: z.number().int().min(1).max(3000),
  chemistryProfiles: z.array(z.enum(BATTERY_CHEMISTRIES)).min(1, 'Pick at least one profile.'),
  efficiency: z.number({ error: 'Efficiency must be a number.' }).min(0.5, 'Efficiency between 0.50 and 1.00.').max(1, 'Efficiency between 0.50 and 1.00.').default(0.85),
  gassingCurrentA: optionalPositive('Gassing current', 500),
  notes: optionalText(2000),
})
export const chargerCreateSchema = chargerFields.superRefine((c, ctx) => {
  if (c.minCapacityAh > c.maxCapacityAh) ctx.addIssue({ code: 'custom', path: ['maxCapacityAh'], message: 'Maximum must be at least the minimum.' })
})

export const cylinderFields = z.object({
  serial: text(60, 'Serial'),
  areaId: uuidRef.nullable().default(null),
  specification: z.enum(CYLINDER_SPECS, { error: 'Pick the specification.' }),
  waterCapacityLb: positive('Water capacity', 2000),
  tareLb: positive('Tare weight', 2000),
  nominalPropaneLb: positive('Propane capacity', 1000),
  manufactureYear: z.number().int().min(1950, 'Year after 1950.').max(2100),
  manufactureMonth: z.number().int().min(1, 'Month 1–12.').max(12, 'Month 1–12.'),
  lastRequalifiedOn: isoDate.nullable().default(null),
  lastRequalificationMethod: z.enum(REQUAL_METHODS).nullable().default(null),
  status: z.enum(CYLINDER_STATUSES).default('empty'),
  notes: optionalText(2000),
})
export const cylinderCreateSchema = cylinderFields.superRefine((c, ctx) => {
  if ((c.lastRequalifiedOn == null) !== (c.lastRequalificationMethod == null)) {
    ctx.addIssue({ code: 'custom', path: ['lastRequalificationMethod'], message: 'Give both the requalification date and its method, or neither.' })
  }
})

export const areaFields = z.object({
  kind: z.enum(AREA_KINDS, { error: 'Pick the kind of area.' }),
  name: text(60, 'Name'),
  floorAreaFt2: optionalPositive('Floor area', 1_000_000),
  roomVolumeFt3: optionalPositive('Room volume', 50_000_000),
  installedExhaustCfm: optionalPositive('Installed exhaust', 1_000_000),
  lpStorageLimitLb: optionalPositive('LP storage limit', 100_000),
  notes: optionalText(2000),
})
export const areaCreateSchema = areaFields

export const assetCreateSchemas = {
  truck: truckCreateSchema,
  battery: batteryCreateSchema,
  charger: chargerCreateSchema,
  cylinder: cylinderCreateSchema,
  area: areaCreateSchema,
} as const

export const assetFieldSchemas = {
  truck: truckFields,
  battery: batteryFields,
  charger: chargerFields,
  cylinder: cylinderFields,
  area: areaFields,
} as const

export const outOfServiceSchema = z.object({
  outOfService: z.boolean(),
  reason: z.string().trim().max(500).default(''),
}).refine(v => !v.outOfService || v.reason.length >= 3, { path: ['reason'], message: 'Say why it is out of service.' })

export const listQuerySchema = z.object({
  siteId: z.uuid('Pick a site.'),
  page: z.coerce.number().int().min(1).max(100000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
  sort: z.string().max(40).optional(),
  dir: z.enum(['asc', 'desc']).default('asc'),
  q: z.string().trim().max(80).optional(),
  filter: z.string().max(400).optional(),
})
export type ListQuery = z.infer<typeof listQuerySchema>

export const idParamsSchema = z.object({ id: z.uuid() })
