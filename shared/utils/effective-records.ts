// The effective-record rule, once: event rows are never changed; a correction is a new row whose
// `correctsId` names the row it replaces. A row that some other row corrects is out; the correction
// stands in its place until it is corrected in turn (a correction of a correction works the same way).
// Every facts loader applies this rule in SQL (server/utils/due/effective.ts); this is the same rule
// over rows in memory, for tests and for anything that already holds a record's history.

export interface CorrectableRow {
  id: string
  correctsId: string | null
}

/** The rows that stand: those no other row corrects. */
export function effectiveRecords<T extends CorrectableRow>(rows: readonly T[]): T[] {
  const superseded = new Set<string>()
  for (const r of rows) if (r.correctsId) superseded.add(r.correctsId)
  return rows.filter(r => !superseded.has(r.id))
}

/** The row that stands for `id` now: follows corrections forward; null when `id` is unknown. */
export function standingVersion<T extends CorrectableRow>(rows: readonly T[], id: string): T | null {
  const byCorrected = new Map<string, T>()
  for (const r of rows) if (r.correctsId) byCorrected.set(r.correctsId, r)
  let current = rows.find(r => r.id === id) ?? null
  const seen = new Set<string>()
  while (current && byCorrected.has(current.id) && !seen.has(current.id)) {
    seen.add(current.id)
    current = byCorrected.get(current.id)!
  }
  return current
}
