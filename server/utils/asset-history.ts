import type { AssetKind } from '#shared/utils/asset-schemas'

export interface HistoryEntry {
  /** unique within the timeline, e.g. 'audit-12' or 'swap-<uuid>' */
  id: string
  at: Date | string
  /** short title in words: "Put in truck MB-12", "Charged on C-3" */
  title: string
  who: string
  detail?: string | null
  tone?: 'neutral' | 'danger' | 'warning' | 'caution' | 'notice' | 'safe'
  changes?: { field: string, from: unknown, to: unknown }[]
}

type HistorySource = (assetId: string, limit: number) => Promise<HistoryEntry[]>

// Feature modules add their event records (swaps, charges, checks, refills, tests) to an asset's
// timeline here; the history route merges every source, newest first.
const sources: Partial<Record<AssetKind, HistorySource[]>> = {}

export function registerHistorySource(kind: AssetKind, source: HistorySource) {
  ;(sources[kind] ??= []).push(source)
}

export function historySourcesFor(kind: AssetKind): HistorySource[] {
  return sources[kind] ?? []
}
