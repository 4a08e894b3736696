import type { AssetKind } from './asset-schemas'
import { AREA_KIND_LABELS, CHARGER_TYPE_LABELS, POWER_LABELS } from './asset-schemas'
import { lbToKg, type UnitSystem } from './units'

export const ASSET_KIND_LABELS: Record<AssetKind, string> = {
  battery: 'Battery', charger: 'Charger', cylinder: 'LP cylinder', truck: 'Truck', area: 'Area',
}

type Row = Record<string, unknown>
// one formatter for every call: toLocaleString with options builds a new one each time
const oneDecimal = new Intl.NumberFormat('en-US', { maximumFractionDigits: 1 })
const n = (v: unknown) => (typeof v === 'number' ? oneDecimal.format(v) : '?')

/** The name people use for the asset: serial, fleet number or name. */
export function assetTitle(kind: AssetKind, row: Row): string {
  const key = kind === 'truck' ? 'fleetNumber' : kind === 'charger' || kind === 'area' ? 'name' : 'serial'
  return String(row[key] ?? '')
}

/** One short line that tells assets of a kind apart on a label or a tag page (US customary units). */
export function assetIdentity(kind: AssetKind, row: Row): string {
  switch (kind) {
    case 'battery': return `${n(row.voltage)} V · ${n(row.capacityAh)} Ah · ${assetTitle(kind, row)}`
    case 'charger': return `${n(row.outputVoltage)} V · ${n(row.maxCurrentA)} A · ${CHARGER_TYPE_LABELS[row.chargerType as keyof typeof CHARGER_TYPE_LABELS]?.split(' ')[0] ?? ''}`
    case 'cylinder': return `WC ${n(row.waterCapacityLb)} lb · tare ${n(row.tareLb)} lb · ${assetTitle(kind, row)}`
    case 'truck': return `${assetTitle(kind, row)} · class ${n(row.truckClass)} · ${POWER_LABELS[row.power as keyof typeof POWER_LABELS] ?? ''}${row.systemVoltage ? ` ${n(row.systemVoltage)} V` : ''}`
    case 'area': return `${assetTitle(kind, row)} · ${AREA_KIND_LABELS[row.kind as keyof typeof AREA_KIND_LABELS] ?? ''}`
  }
}

/** The row fields the identity line is made of, per kind (sent with a tag's view so the page can say it). */
const IDENTITY_FIELDS: Record<AssetKind, string[]> = {
  battery: ['voltage', 'capacityAh', 'serial'],
  charger: ['outputVoltage', 'maxCurrentA', 'chargerType', 'name'],
  cylinder: ['waterCapacityLb', 'tareLb', 'serial'],
  truck: ['fleetNumber', 'truckClass', 'power', 'systemVoltage'],
  area: ['name', 'kind'],
}

export type IdentityFacts = Record<string, string | number | null>

export function identityFacts(kind: AssetKind, row: Row): IdentityFacts {
  return Object.fromEntries(IDENTITY_FIELDS[kind].map(k => [k, typeof row[k] === 'number' || typeof row[k] === 'string' ? row[k] as string | number : null]))
}

/** Words by key with {named} values: vue-i18n's `t` on a page, mailWords on the server. */
export type SayWords = (key: string, params?: Record<string, string | number>) => string

/**
 * The identity line in the reader's words (`asset_identity.<kind>`, power, charger type and area kind named)
 * and the site's units (a cylinder's weights in kg on a metric site).
 */
export function assetIdentityIn(kind: AssetKind, row: Row, say: SayWords, units: UnitSystem): string {
  const title = assetTitle(kind, row)
  const weight = (lb: unknown) => (typeof lb === 'number' ? (units === 'metric' ? `${n(lbToKg(lb))} kg` : `${n(lb)} lb`) : '?')
  switch (kind) {
    case 'battery': return say('asset_identity.battery', { volts: n(row.voltage), ah: n(row.capacityAh), title })
    case 'charger': return say('asset_identity.charger', { volts: n(row.outputVoltage), amps: n(row.maxCurrentA), type: say(`asset_identity.charger_type.${String(row.chargerType)}`) })
    case 'cylinder': return say('asset_identity.cylinder', { wc: weight(row.waterCapacityLb), tare: weight(row.tareLb), title })
    case 'truck': return say('asset_identity.truck', { title, class: n(row.truckClass), power: say(`asset_identity.power.${String(row.power)}`) }) + (typeof row.systemVoltage === 'number' ? ` ${n(row.systemVoltage)} V` : '')
    case 'area': return say('asset_identity.area', { title, kind: say(`asset_identity.area_kind.${String(row.kind)}`) })
  }
}
