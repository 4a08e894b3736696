import type { AssetKind } from '#shared/utils/asset-schemas'

export type StatusTone = 'neutral' | 'danger' | 'warning' | 'caution' | 'notice' | 'safe'

export interface AssetStatus {
  /** a stable key, e.g. 'ready', 'out_of_service', 'full' */
  state: string
  /** the state in words, as product.md names it (e.g. "Ready", "Out of service") */
  label: string
  tone: StatusTone
  /** the state's particulars for the reader's words: the truck a battery is in, the charger it is on, minutes of cooling left */
  params?: { truck?: string, charger?: string, minutesLeft?: number }
  /** further flags in words, e.g. "Watering due" (with `params` for the reader's words, e.g. a time) */
  flags: { key: string, label: string, tone: StatusTone, params?: Record<string, string | number> }[]
  /** what is due on the asset, soonest first (from its obligations; a count rule may have no date) */
  due: { what: string, kind?: string, dueOn: string | null, state: 'upcoming' | 'due_soon' | 'overdue', detail?: string | null, detailWords?: { code: string, params?: Record<string, string | number> } | null, action?: { label: string, to: string } }[]
}

type AssetRow = Record<string, unknown> & { id: string, siteId: string }
type StatusProvider = (row: AssetRow) => Promise<Partial<AssetStatus> | null>

// Feature modules register how they describe an asset's state (battery room, fuel station, due engine);
// the tag page and detail pages ask here. Providers run at once; their answers merge in registration order and later ones refine.
const providers: Partial<Record<AssetKind, StatusProvider[]>> = {}

export function registerAssetStatus(kind: AssetKind, provider: StatusProvider) {
  ;(providers[kind] ??= []).push(provider)
}

export async function assetStatus(kind: AssetKind, row: AssetRow): Promise<AssetStatus> {
  let status: AssetStatus = row.outOfService
    ? { state: 'out_of_service', label: 'Out of service', tone: 'danger', flags: [], due: [] }
    : { state: 'in_service', label: 'In service', tone: 'neutral', flags: [], due: [] }
  if (kind === 'cylinder' && !row.outOfService) {
    const s = String(row.status)
    const tones: Record<string, StatusTone> = { full: 'safe', empty: 'neutral', in_use: 'notice', quarantined: 'warning', condemned: 'danger' }
    status = { ...status, state: s, label: CYLINDER_STATUS_LABELS[s as keyof typeof CYLINDER_STATUS_LABELS] ?? s, tone: tones[s] ?? 'neutral' }
  }
  // the providers ask at once; their answers are merged in registration order
  const answers = await Promise.all((providers[kind] ?? []).map(provider => provider(row)))
  for (const more of answers) {
    if (more) status = { ...status, ...more, flags: [...status.flags, ...(more.flags ?? [])], due: [...status.due, ...(more.due ?? [])] }
  }
  status.due.sort((a, b) => (a.dueOn ?? '0000').localeCompare(b.dueOn ?? '0000'))
  return status
}
