import { z } from 'zod'
import { ASSET_KINDS } from '#shared/utils/asset-schemas'

const ParamsSchema = z.object({ kind: z.enum(ASSET_KINDS), id: z.uuid() })

/**
 * The most rows one export carries. A truck inspected daily and swapped three times a day for ten years has
 * about 15,000; past this the export refuses in words rather than leave the oldest rows out.
 */
const HISTORY_EXPORT_LIMIT = 50_000

// The asset's whole timeline as CSV, newest first: every row, a corrected record and its correction both,
// with which corrects which (the page shows the latest; an inspector asks for all of it).
export default defineAbilityHandler('site.member', async (event) => {
  const { kind, id } = validateParams(event, ParamsSchema)
  await findAssetForActor(event, kind, id)
  const items = await assetTimeline(kind, id, HISTORY_EXPORT_LIMIT + 1)
  if (items.length > HISTORY_EXPORT_LIMIT) {
    throw codedError(422, 'history_too_long', `This history has more than ${HISTORY_EXPORT_LIMIT} events, more than one export carries; ask the database administrator for the records.`, { params: { limit: HISTORY_EXPORT_LIMIT } })
  }
  return sendCsv(event, `history-${kind}-${id.slice(0, 8)}.csv`, csvText(HISTORY_CSV_COLUMNS, historyCsvRows(items)))
})
