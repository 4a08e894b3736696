import type { CorrectionFacts } from '#shared/utils/audit-pack'

// SQL pieces every audit-pack section shares. Each section's statement takes the same parameters:
// $1 the site, $2 the first day, $3 the last day (both whole days in the site's time), $4 the site's time zone.

/** A timestamp written in the site's time. */
export const packSiteTime = (column: string) => `to_char(${column} AT TIME ZONE $4, 'YYYY-MM-DD HH24:MI')`

/** A timestamp column inside the range of whole site days. */
export const packInRange = (column: string) =>
  `${column} >= ($2::date)::timestamp AT TIME ZONE $4 AND ${column} < ($3::date + 1)::timestamp AT TIME ZONE $4`

/**
 * The correction columns of an event table aliased `t` (author joined as `u`): what it corrects and why,
 * and the latest row that corrects it (`c`), by whom and when.
 */
export function packCorrectionColumns(table: string): { select: string, join: string } {
  return {
    select: `t.id AS "id", t.corrects_id AS "correctsId", t.correction_reason AS "correctionReason",
      u.name AS "recordedBy", ${packSiteTime('t.recorded_at')} AS "recordedAt",
      c.id AS "correctedById", c.name AS "correctedBy", ${packSiteTime('c.recorded_at')} AS "correctedAt"`,
    join: `JOIN users u ON u.id = t.user_id
      LEFT JOIN LATERAL (SELECT c.id, c.recorded_at, cu.name FROM ${table} c JOIN users cu ON cu.id = c.user_id
        WHERE c.corrects_id = t.id ORDER BY c.recorded_at DESC, c.id DESC LIMIT 1) c ON true`,
  }
}

export type PackCorrectableRow = CorrectionFacts & { id: string }

/** The ids a CSV row carries after its columns, so a reader can pair an original with its correction. */
export const CORRECTION_CSV_FIELDS = ['record_id', 'corrects', 'corrected_by', 'correction_reason'] as const
export const correctionCsvCells = (r: PackCorrectableRow) => [r.id, r.correctsId ?? '', r.correctedById ?? '', r.correctionReason ?? '']
