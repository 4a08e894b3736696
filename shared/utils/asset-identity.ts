import type { AssetKind } from './asset-schemas'
import { AREA_KIND_LABELS, CHARGER_TYPE_LABELS, POWER_LABELS } from './asset-schemas'

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
