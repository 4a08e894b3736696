import type { AssetKind } from '#shared/utils/asset-schemas'

export interface TagAsset {
  kind: AssetKind
  id: string
  code: string
  state: string
  outOfService: boolean
}

export interface TagAction {
  key: string
  label: string
  kinds: readonly AssetKind[]
  roles: readonly Role[]
  /** the asset states it fits; omit for any state */
  states?: readonly string[]
  /** where it goes */
  to: (asset: TagAsset) => string
  primary?: boolean
}

const floor: Role[] = ['technician', 'facilities_lead', 'safety_lead', 'admin']
const everyone: Role[] = ['operator', ...floor]

// The actions a scanned tag offers, by asset kind, state and role. Feature modules add theirs here;
// the tag page shows the first four that fit, primary ones first.
export const TAG_ACTIONS: TagAction[] = [
  { key: 'swap-in', label: 'Put in a truck', kinds: ['battery'], roles: everyone, states: ['ready'], to: a => `/swap?in=${a.code}`, primary: true },
  { key: 'reading', label: 'Take a reading', kinds: ['battery'], roles: floor, states: ['ready', 'cooling', 'needs_charge'], to: a => `/check?battery=${a.code}` },
  { key: 'charge-on', label: 'Put on charge', kinds: ['battery'], roles: floor, states: ['needs_charge'], to: a => `/charge?battery=${a.code}`, primary: true },
  { key: 'charge-off', label: 'Take off charge', kinds: ['battery'], roles: floor, states: ['on_charge'], to: a => `/charge?battery=${a.code}`, primary: true },
  { key: 'charger-on', label: 'Put a battery on', kinds: ['charger'], roles: floor, to: a => `/charge?charger=${a.code}`, primary: true },
  { key: 'truck-swap', label: 'Change its battery', kinds: ['truck'], roles: everyone, states: ['battery_in', 'battery_needed'], to: a => `/swap?truck=${a.code}`, primary: true },
  { key: 'cylinder-on-truck', label: 'Put on a truck', kinds: ['cylinder'], roles: everyone, states: ['full'], to: a => `/exchange?on=${a.code}`, primary: true },
  { key: 'cylinder-refill', label: 'Refill', kinds: ['cylinder'], roles: floor, states: ['empty'], to: a => `/refill?code=${a.code}`, primary: true },
  { key: 'truck-cylinder', label: 'Change its cylinder', kinds: ['truck'], roles: everyone, states: ['cylinder_fitted', 'cylinder_needed'], to: a => `/exchange?truck=${a.id}`, primary: true },
  { key: 'truck-emissions', label: 'Record emissions test', kinds: ['truck'], roles: ['facilities_lead', 'admin'], states: ['cylinder_fitted', 'cylinder_needed', 'engine_in_service'], to: a => `/emissions?truck=${a.id}` },
  { key: 'area-log', label: 'Fill in today\'s log', kinds: ['area'], roles: ['technician'], to: a => `/logs?area=${a.id}`, primary: true },
  { key: 'area-sign', label: 'Review and sign', kinds: ['area'], roles: ['safety_lead'], to: a => `/logs?area=${a.id}&review=1`, primary: true },
  { key: 'incident', label: 'Report an incident', kinds: ['battery', 'charger', 'cylinder', 'truck', 'area'], roles: everyone, to: a => `/incidents?asset=${a.code}` },
  { key: 'hold', label: 'Take out of service', kinds: ['battery', 'charger', 'cylinder', 'truck'], roles: floor, to: a => `${ASSET_VIEWS[a.kind].path}/${a.id}#service` },
  { key: 'open', label: 'Open the full record', kinds: ['battery', 'charger', 'cylinder', 'truck', 'area'], roles: everyone, to: a => `${ASSET_VIEWS[a.kind].path}/${a.id}` },
]

export function actionsFor(asset: TagAsset, roles: readonly Role[], limit = 4): TagAction[] {
  return TAG_ACTIONS
    .filter(a => a.kinds.includes(asset.kind)
      && a.roles.some(r => roles.includes(r))
      && (!a.states || a.states.includes(asset.state))
      && !(a.key === 'hold' && asset.outOfService))
    .sort((a, b) => Number(!!b.primary) - Number(!!a.primary))
    .slice(0, limit)
}
