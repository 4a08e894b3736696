import type { DueItem } from '~/stores/due'

/** A row of a home's "now" list: an obligation, or "N more of this task" after the first few of one task. */
export type NowRow = { item: DueItem } | { more: number, key: string, what: DueItem, to: string }

/** The task an obligation belongs to: its kind, or `custom:<schedule id>` for a schedule a lead added. */
export const taskKey = (i: Pick<DueItem, 'kind' | 'scheduleId'>) => (i.kind === 'custom' ? `custom:${i.scheduleId}` : i.kind)

/**
 * The "now" list with each task cut to its first `keep` obligations (in the list's order) and a row that says how
 * many more there are and opens them in the due list: ten chargers' maintenance no longer hide the one emissions
 * test. A task with one more than `keep` shows it rather than a "1 more" row.
 */
export function bundleByTask(items: readonly DueItem[], keep = 3): NowRow[] {
  const total = new Map<string, number>()
  for (const i of items) total.set(taskKey(i), (total.get(taskKey(i)) ?? 0) + 1)
  const seen = new Map<string, number>()
  const rows: NowRow[] = []
  for (const i of items) {
    const key = taskKey(i)
    const n = (seen.get(key) ?? 0) + 1
    seen.set(key, n)
    const all = total.get(key)!
    if (all <= keep + 1 || n <= keep) rows.push({ item: i })
    if (all > keep + 1 && n === keep) {
      const query = new URLSearchParams({ kind: i.kind, ...(i.scheduleId && i.kind === 'custom' ? { schedule: i.scheduleId } : {}), state: 'overdue,due_soon' })
      rows.push({ more: all - keep, key, what: i, to: `/due?${query.toString()}` })
    }
  }
  return rows
}
