import type { AssetKind } from '#shared/utils/asset-schemas'
import { BATTERY_STATE_LABELS } from '#shared/utils/battery-state'
import {
  AREA_KIND_LABELS, BATTERY_CHEMISTRIES, CHARGER_TYPE_LABELS, CHEMISTRY_LABELS, CYLINDER_SPEC_LABELS,
  CYLINDER_STATUS_LABELS, POWER_LABELS, REQUAL_METHOD_LABELS, TRUCK_CLASS_LABELS,
} from '#shared/utils/asset-schemas'

/** Canonical unit of a measured field; metric sites see and type the metric equivalent. */
export type MeasureUnit = 'lb' | 'in' | 'ft2' | 'ft3' | 'cfm'

export interface FieldView {
  key: string
  label: string
  type: 'text' | 'number' | 'int' | 'select' | 'multi' | 'date' | 'area' | 'textarea'
  unit?: MeasureUnit
  options?: Record<string, string>
  areaKind?: 'charging_area' | 'fuel_station'
  hint?: string
  step?: string
  /** shown only when this returns true for the form's current values */
  when?: (v: Record<string, unknown>) => boolean
  /** a number written as is, with no digit grouping (a year) */
  plain?: boolean
}

export interface ColumnView {
  key: string
  label: string
  sortable?: boolean
  unit?: MeasureUnit
  options?: Record<string, string>
  /** a unit that is never converted (V, Ah, A, h), written after the value where no column head names it: the phone's cards */
  suffix?: string
  /** a number written as is, with no digit grouping (a year: 2014, not 2,014) */
  plain?: boolean
  /** the cells are calendar days ('2026-03-31'), shown as the reader's language writes a date */
  date?: boolean
}

export interface AssetView {
  kind: AssetKind
  path: string
  api: string
  noun: string
  plural: string
  titleKey: string
  columns: ColumnView[]
  filters: { key: string, label: string, options: Record<string, string> }[]
  fields: FieldView[]
}

const chemistryOptions = Object.fromEntries(BATTERY_CHEMISTRIES.map(c => [c, CHEMISTRY_LABELS[c]]))
const classOptions = Object.fromEntries(Object.entries(TRUCK_CLASS_LABELS).map(([k, v]) => [k, v]))
const electric = (v: Record<string, unknown>) => v.power === 'electric'
const yesNo = { true: 'Out of service', false: 'In service' }

export const ASSET_VIEWS: Record<AssetKind, AssetView> = {
  truck: {
    kind: 'truck', path: ASSET_PATHS.truck, api: '/api/trucks', noun: 'truck', plural: 'Trucks', titleKey: 'fleetNumber',
    columns: [
      { key: 'fleetNumber', label: 'Fleet no.', sortable: true },
      { key: 'truckClass', label: 'Class', sortable: true },
      { key: 'power', label: 'Power', sortable: true, options: POWER_LABELS },
      { key: 'model', label: 'Model' },
      { key: 'systemVoltage', label: 'Volts', sortable: true, suffix: 'V' },
      { key: 'minBatteryWeightLb', label: 'Min battery', unit: 'lb' },
      { key: 'hourMeter', label: 'Hours', sortable: true, suffix: 'h' },
    ],
    filters: [
      { key: 'power', label: 'Power', options: POWER_LABELS },
      { key: 'truckClass', label: 'Class', options: classOptions },
      { key: 'outOfService', label: 'Service', options: yesNo },
    ],
    fields: [
      { key: 'fleetNumber', label: 'Fleet number', type: 'text' },
      { key: 'truckClass', label: 'Truck class', type: 'select', options: classOptions },
      { key: 'power', label: 'Power', type: 'select', options: POWER_LABELS },
      { key: 'model', label: 'Model / description', type: 'text' },
      { key: 'homeAreaId', label: 'Home area', type: 'area' },
      { key: 'systemVoltage', label: 'System voltage (V)', type: 'int', when: electric },
      { key: 'connector', label: 'Battery connector', type: 'text', when: electric },
      { key: 'allowedChemistries', label: 'Battery chemistries allowed', type: 'multi', options: chemistryOptions, when: electric },
      { key: 'compartmentLengthIn', label: 'Compartment length', type: 'number', unit: 'in', when: electric },
      { key: 'compartmentWidthIn', label: 'Compartment width', type: 'number', unit: 'in', when: electric },
      { key: 'compartmentHeightIn', label: 'Compartment height', type: 'number', unit: 'in', when: electric },
      { key: 'minBatteryWeightLb', label: 'Nameplate minimum battery weight', type: 'number', unit: 'lb', when: electric, hint: 'From the truck nameplate. A lighter battery upsets the counterweight.' },
      { key: 'maxBatteryWeightLb', label: 'Nameplate maximum battery weight', type: 'number', unit: 'lb', when: electric },
      { key: 'hourMeter', label: 'Hour meter when registered', type: 'number', step: '0.1', hint: 'Swaps and cylinder changes record it from then on.' },
      { key: 'notes', label: 'Notes', type: 'textarea' },
    ],
  },
  battery: {
    kind: 'battery', path: ASSET_PATHS.battery, api: '/api/batteries', noun: 'battery', plural: 'Batteries', titleKey: 'serial',
    columns: [
      { key: 'serial', label: 'Serial', sortable: true },
      { key: 'voltage', label: 'Volts', sortable: true, suffix: 'V' },
      { key: 'capacityAh', label: 'Ah', sortable: true, suffix: 'Ah' },
      { key: 'chemistry', label: 'Chemistry', sortable: true, options: chemistryOptions },
      { key: 'weightLb', label: 'Weight', sortable: true, unit: 'lb' },
      { key: 'connector', label: 'Connector' },
      { key: 'cycleCount', label: 'Cycles', sortable: true },
      { key: 'state', label: 'State', options: BATTERY_STATE_LABELS },
    ],
    filters: [
      { key: 'chemistry', label: 'Chemistry', options: chemistryOptions },
      { key: 'voltage', label: 'Voltage', options: { 24: '24 V', 36: '36 V', 48: '48 V', 72: '72 V', 80: '80 V' } },
      { key: 'outOfService', label: 'Service', options: yesNo },
    ],
    fields: [
      { key: 'serial', label: 'Serial', type: 'text' },
      { key: 'chemistry', label: 'Chemistry', type: 'select', options: chemistryOptions },
      { key: 'voltage', label: 'Nominal voltage (V)', type: 'int' },
      { key: 'cellCount', label: 'Cells', type: 'int', hint: 'Lead-acid: 2 V per cell (48 V = 24 cells).' },
      { key: 'capacityAh', label: 'Rated capacity (Ah)', type: 'int' },
      { key: 'capacityHourRate', label: 'Capacity hour rate (h)', type: 'int' },
      { key: 'weightLb', label: 'Service weight', type: 'number', unit: 'lb' },
      { key: 'lengthIn', label: 'Length', type: 'number', unit: 'in' },
      { key: 'widthIn', label: 'Width', type: 'number', unit: 'in' },
      { key: 'heightIn', label: 'Height', type: 'number', unit: 'in' },
      { key: 'connector', label: 'Connector', type: 'text' },
      { key: 'homeAreaId', label: 'Home charging area', type: 'area', areaKind: 'charging_area' },
      { key: 'manufacturedOn', label: 'Manufactured', type: 'date' },
      { key: 'inServiceOn', label: 'In service since', type: 'date' },
      { key: 'ratedCycles', label: 'Rated cycles', type: 'int' },
      { key: 'replacementPrice', label: 'Replacement price', type: 'number', hint: 'In the site\'s currency; the replacement forecast adds these up.' },
      { key: 'notes', label: 'Notes', type: 'textarea' },
    ],
  },
  charger: {
    kind: 'charger', path: ASSET_PATHS.charger, api: '/api/chargers', noun: 'charger', plural: 'Chargers', titleKey: 'name',
    columns: [
      { key: 'name', label: 'Name', sortable: true },
      { key: 'outputVoltage', label: 'Volts', sortable: true, suffix: 'V' },
      { key: 'maxCurrentA', label: 'Max A', sortable: true, suffix: 'A' },
      { key: 'chargerType', label: 'Type', sortable: true, options: CHARGER_TYPE_LABELS },
      { key: 'minCapacityAh', label: 'Min Ah', suffix: 'Ah' },
      { key: 'maxCapacityAh', label: 'Max Ah', suffix: 'Ah' },
    ],
    filters: [{ key: 'outOfService', label: 'Service', options: yesNo }],
    fields: [
      { key: 'name', label: 'Name', type: 'text' },
      { key: 'serial', label: 'Serial', type: 'text' },
      { key: 'areaId', label: 'Charging area', type: 'area', areaKind: 'charging_area' },
      { key: 'chargerType', label: 'Charger type', type: 'select', options: CHARGER_TYPE_LABELS },
      { key: 'outputVoltage', label: 'Output voltage (V)', type: 'int' },
      { key: 'maxCurrentA', label: 'Maximum current (A)', type: 'number' },
      { key: 'minCapacityAh', label: 'Smallest battery (Ah)', type: 'int' },
      { key: 'maxCapacityAh', label: 'Largest battery (Ah)', type: 'int' },
      { key: 'chemistryProfiles', label: 'Chemistry profiles', type: 'multi', options: chemistryOptions },
      { key: 'efficiency', label: 'Efficiency (0.50–1.00)', type: 'number', step: '0.01' },
      { key: 'gassingCurrentA', label: 'Gassing current (A), if known', type: 'number', hint: 'Leave empty to use the default for the charger type.' },
      { key: 'notes', label: 'Notes', type: 'textarea' },
    ],
  },
  cylinder: {
    kind: 'cylinder', path: ASSET_PATHS.cylinder, api: '/api/cylinders', noun: 'LP cylinder', plural: 'LP cylinders', titleKey: 'serial',
    columns: [
      { key: 'serial', label: 'Serial', sortable: true },
      { key: 'status', label: 'Status', sortable: true, options: CYLINDER_STATUS_LABELS },
      { key: 'specification', label: 'Spec', options: CYLINDER_SPEC_LABELS },
      { key: 'waterCapacityLb', label: 'Water capacity', sortable: true, unit: 'lb' },
      { key: 'tareLb', label: 'Tare', unit: 'lb' },
      { key: 'manufactureYear', label: 'Made', sortable: true, plain: true },
      { key: 'lastRequalifiedOn', label: 'Last requalified', sortable: true, date: true },
    ],
    filters: [
      { key: 'status', label: 'Status', options: CYLINDER_STATUS_LABELS },
      { key: 'specification', label: 'Spec', options: CYLINDER_SPEC_LABELS },
    ],
    fields: [
      { key: 'serial', label: 'Serial', type: 'text' },
      { key: 'specification', label: 'Specification', type: 'select', options: CYLINDER_SPEC_LABELS },
      { key: 'areaId', label: 'Fuel station', type: 'area', areaKind: 'fuel_station' },
      { key: 'waterCapacityLb', label: 'Water capacity (stamped)', type: 'number', unit: 'lb' },
      { key: 'tareLb', label: 'Tare weight (stamped)', type: 'number', unit: 'lb' },
      { key: 'nominalPropaneLb', label: 'Propane capacity', type: 'number', unit: 'lb' },
      { key: 'manufactureMonth', label: 'Manufacture month', type: 'int' },
      { key: 'manufactureYear', label: 'Manufacture year', type: 'int', plain: true },
      { key: 'lastRequalifiedOn', label: 'Last requalified on', type: 'date' },
      { key: 'lastRequalificationMethod', label: 'Requalification method', type: 'select', options: REQUAL_METHOD_LABELS },
      { key: 'status', label: 'Status', type: 'select', options: { full: 'Full', empty: 'Empty', quarantined: 'Quarantined', condemned: 'Condemned' } },
      { key: 'notes', label: 'Notes', type: 'textarea' },
    ],
  },
  area: {
    kind: 'area', path: ASSET_PATHS.area, api: '/api/areas', noun: 'area', plural: 'Areas', titleKey: 'name',
    columns: [
      { key: 'name', label: 'Name', sortable: true },
      { key: 'kind', label: 'Kind', sortable: true, options: AREA_KIND_LABELS },
      { key: 'floorAreaFt2', label: 'Floor area', unit: 'ft2' },
      { key: 'installedExhaustCfm', label: 'Exhaust', unit: 'cfm' },
      { key: 'lpStorageLimitLb', label: 'LP limit', unit: 'lb' },
    ],
    filters: [{ key: 'kind', label: 'Kind', options: AREA_KIND_LABELS }],
    fields: [
      { key: 'name', label: 'Name', type: 'text' },
      { key: 'kind', label: 'Kind', type: 'select', options: AREA_KIND_LABELS },
      { key: 'floorAreaFt2', label: 'Floor area', type: 'number', unit: 'ft2' },
      { key: 'roomVolumeFt3', label: 'Room volume', type: 'number', unit: 'ft3' },
      { key: 'installedExhaustCfm', label: 'Installed exhaust airflow', type: 'number', unit: 'cfm' },
      { key: 'lpStorageLimitLb', label: 'LP storage limit', type: 'number', unit: 'lb', when: v => v.kind === 'fuel_station' },
      { key: 'notes', label: 'Notes', type: 'textarea' },
    ],
  },
}

const UNIT_LABELS: Record<'us' | 'metric', Record<MeasureUnit, string>> = {
  us: { lb: 'lb', in: 'in', ft2: 'ft²', ft3: 'ft³', cfm: 'cfm' },
  metric: { lb: 'kg', in: 'mm', ft2: 'm²', ft3: 'm³', cfm: 'm³/h' },
}
export const unitLabel = (unit: MeasureUnit, system: 'us' | 'metric') => UNIT_LABELS[system][unit]

const TO_METRIC: Record<MeasureUnit, (v: number) => number> = { lb: lbToKg, in: inToMm, ft2: ft2ToM2, ft3: ft3ToM3, cfm: cfmToM3PerHour }
const FROM_METRIC: Record<MeasureUnit, (v: number) => number> = { lb: kgToLb, in: mmToIn, ft2: m2ToFt2, ft3: m3ToFt3, cfm: m3PerHourToCfm }

/** A stored (US customary) value as the site shows it. */
export function toSiteUnits(value: number, unit: MeasureUnit, system: 'us' | 'metric'): number {
  return system === 'metric' ? TO_METRIC[unit](value) : value
}
/** A value typed in the site's units, back to the stored unit. */
export function fromSiteUnits(value: number, unit: MeasureUnit, system: 'us' | 'metric'): number {
  return system === 'metric' ? FROM_METRIC[unit](value) : value
}

export function formatMeasure(value: unknown, unit: MeasureUnit, system: 'us' | 'metric'): string {
  if (typeof value !== 'number') return '—'
  const shown = toSiteUnits(value, unit, system)
  const digits = unit === 'in' && system === 'us' ? 1 : 0
  return `${shown.toLocaleString('en-US', { maximumFractionDigits: digits })} ${unitLabel(unit, system)}`
}

/** A cell on a phone's card, where no column head says what the number is: its fixed unit follows it ("24 V"). */
export function formatCardCell(value: unknown, col: Pick<ColumnView, 'unit' | 'options' | 'suffix' | 'plain'>, system: 'us' | 'metric'): string {
  const text = formatCell(value, col, system)
  return col.suffix && text !== '—' ? `${text} ${col.suffix}` : text
}

export function formatCell(value: unknown, col: Pick<ColumnView, 'unit' | 'options' | 'plain'>, system: 'us' | 'metric'): string {
  if (value === null || value === undefined || value === '') return '—'
  if (col.unit) return formatMeasure(value, col.unit, system)
  // a list (allowed chemistries, charger profiles) by its options' names, before a single value's look-up
  if (Array.isArray(value)) return value.map(v => col.options?.[v] ?? v).join(', ') || '—'
  if (col.options) return col.options[String(value)] ?? String(value)
  if (typeof value === 'number') return col.plain ? String(value) : value.toLocaleString('en-US', { maximumFractionDigits: 1 })
  return String(value)
}

/** A page's name inside a sentence ("Search batteries…"): its first letter lowered, unless its first word is an acronym ("LP cylinders", "GLP"). */
export function inSentence(name: string): string {
  const first = name.split(/\s/, 1)[0] ?? ''
  return first.length > 1 && first === first.toLocaleUpperCase() ? name : name.charAt(0).toLocaleLowerCase() + name.slice(1)
}
