import type { AssetKind } from '#shared/utils/asset-schemas'
import { can, type Ability } from '#shared/utils/abilities'
import { chargesInTruck } from '#shared/utils/chemistry-rules'

export interface TagAsset {
  kind: AssetKind
  id: string
  code: string
  state: string
  outOfService: boolean
  /** a battery's chemistry (chemistry-rules.ts decides what it is offered) */
  chemistry?: string | null
}

export interface TagAction {
  key: string
  label: string
  kinds: readonly AssetKind[]
  /** offered to whoever holds this ability at the asset's site (shared/utils/abilities.ts) */
  ability: Ability
  /** the asset states it fits; omit for any state */
  states?: readonly string[]
  /** where it goes */
  to: (asset: TagAsset) => string
  primary?: boolean
  /** a further test on the asset (its chemistry), beyond kind and state */
  fits?: (asset: TagAsset) => boolean
}

// The actions a scanned tag offers, by asset kind, state and role. Feature modules add theirs here;
// the tag page shows the first four that fit, primary ones first.
export const TAG_ACTIONS: TagAction[] = [
  { key: 'swap-in', label: 'Put in a truck', kinds: ['battery'], ability: 'swap.record', states: ['ready'], to: a => `/swap?in=${a.code}`, primary: true },
  { key: 'reading', label: 'Take a reading', kinds: ['battery'], ability: 'reading.record', states: ['ready', 'cooling', 'needs_charge'], to: a => `/check?battery=${a.code}`, fits: a => !a.chemistry || a.chemistry === 'flooded_lead_acid' },
  { key: 'charge-on', label: 'Put on charge', kinds: ['battery'], ability: 'charge.record', states: ['needs_charge'], to: a => `/charge?battery=${a.code}`, primary: true },
  // lithium-ion is charged in the truck during breaks (opportunity charging)
  { key: 'charge-in-truck', label: 'Put on charge in the truck', kinds: ['battery'], ability: 'charge.record', states: ['in_truck'], to: a => `/charge?battery=${a.code}`, fits: a => chargesInTruck(a.chemistry ?? '') },
  { key: 'charge-off', label: 'Take off charge', kinds: ['battery'], ability: 'charge.record', states: ['on_charge'], to: a => `/charge?battery=${a.code}`, primary: true },
  { key: 'charger-on', label: 'Put a battery on', kinds: ['charger'], ability: 'charge.record', to: a => `/charge?charger=${a.code}`, primary: true },
  { key: 'truck-return', label: 'Return to service', kinds: ['truck'], ability: 'inspection.return', states: ['inspection_hold'], to: a => `/inspect?truck=${a.id}#return`, primary: true },
  { key: 'truck-inspect', label: 'Pre-shift check', kinds: ['truck'], ability: 'inspection.record', to: a => `/inspect?truck=${a.id}`, primary: true },
  { key: 'truck-swap', label: 'Change its battery', kinds: ['truck'], ability: 'swap.record', states: ['battery_in', 'battery_needed'], to: a => `/swap?truck=${a.code}`, primary: true },
  { key: 'cylinder-on-truck', label: 'Put on a truck', kinds: ['cylinder'], ability: 'cylinder.exchange', states: ['full'], to: a => `/exchange?on=${a.code}`, primary: true },
  { key: 'cylinder-refill', label: 'Refill', kinds: ['cylinder'], ability: 'refill.record', states: ['empty'], to: a => `/refill?code=${a.code}`, primary: true },
  { key: 'truck-cylinder', label: 'Change its cylinder', kinds: ['truck'], ability: 'cylinder.exchange', states: ['cylinder_fitted', 'cylinder_needed'], to: a => `/exchange?truck=${a.id}`, primary: true },
  { key: 'truck-emissions', label: 'Record emissions test', kinds: ['truck'], ability: 'emissions.record', states: ['cylinder_fitted', 'cylinder_needed', 'engine_in_service'], to: a => `/emissions?truck=${a.id}` },
  { key: 'area-log', label: 'Fill in today\'s log', kinds: ['area'], ability: 'log.record', to: a => `/logs?area=${a.id}`, primary: true },
  { key: 'area-sign', label: 'Review and sign', kinds: ['area'], ability: 'log.sign', to: a => `/logs?area=${a.id}&review=1`, primary: true },
  { key: 'incident', label: 'Report an incident', kinds: ['battery', 'charger', 'cylinder', 'truck', 'area'], ability: 'incident.report', to: a => `/incidents?asset=${a.code}` },
  { key: 'hold', label: 'Take out of service', kinds: ['battery', 'charger', 'cylinder', 'truck'], ability: 'asset.hold', to: a => `${ASSET_VIEWS[a.kind].path}/${a.id}#service` },
  { key: 'open', label: 'Open the full record', kinds: ['battery', 'charger', 'cylinder', 'truck', 'area'], ability: 'site.member', to: a => `${ASSET_VIEWS[a.kind].path}/${a.id}` },
]

export function actionsFor(asset: TagAsset, roles: readonly Role[], limit = 4): TagAction[] {
  return TAG_ACTIONS
    .filter(a => a.kinds.includes(asset.kind)
      && roles.length > 0 && can(roles, a.ability)
      && (!a.states || a.states.includes(asset.state))
      && (!a.fits || a.fits(asset))
      && !(a.key === 'hold' && asset.outOfService))
    .sort((a, b) => Number(!!b.primary) - Number(!!a.primary))
    .slice(0, limit)
}
