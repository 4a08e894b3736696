import type { SQL } from 'drizzle-orm'
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

// A provider may also say how to read its facts inside the tag look-up's own statement (one JSON value
// about the asset's row, `table` being the asset's table there): the look-up then keeps what came with the
// row (keepFactsWithAsset), and the provider takes it from there instead of asking PostgreSQL again.
// A row found the long way (a tag whose code's letter does not name its kind) brings no facts: a provider
// always handles a row without them.
type FactsSql = (table: SQL) => SQL
const factSqls: Partial<Record<AssetKind, { key: string, sql: FactsSql }[]>> = {}

export function registerAssetFacts(kind: AssetKind, key: string, factsSql: FactsSql) {
  if (!/^[a-z_]+$/.test(key)) throw new Error(`asset facts key ${key}: lower-case letters and _ only`)
  ;(factSqls[kind] ??= []).push({ key, sql: factsSql })
}

/** One JSON object of every registered provider's facts about the row of `table`, or null when none registered. */
export function assetFactsSql(kind: AssetKind, table: SQL): SQL | null {
  const parts = factSqls[kind] ?? []
  if (!parts.length) return null
  return sql`json_build_object(${sql.join(parts.map(p => sql`${sql.raw(`'${p.key}'`)}, ${p.sql(table)}`), sql`, `)})`
}

const factsWithAsset = new WeakMap<object, Record<string, unknown>>()
/** Keeps the facts that came with an asset's row, for its providers (keyed by the row object, gone with it). */
export const keepFactsWithAsset = (row: object, facts: Record<string, unknown>) => void factsWithAsset.set(row, facts)
/** The facts of `key` that came with the row, or undefined when it came without them. */
export function factsCameWithAsset<T>(row: object, key: string): T | undefined {
  const facts = factsWithAsset.get(row)
  return facts && key in facts ? facts[key] as T : undefined
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
