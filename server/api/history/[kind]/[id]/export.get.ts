import { z } from 'zod'
import { ASSET_KINDS } from '#shared/utils/asset-schemas'

const ParamsSchema = z.object({ kind: z.enum(ASSET_KINDS), id: z.uuid() })

// The asset's timeline as CSV: every row, a corrected record and its correction both, with which corrects which.
export default defineAbilityHandler('site.member', async (event) => {
  const { kind, id } = validateParams(event, ParamsSchema)
  await findAssetForActor(event, kind, id)
  const items = await assetTimeline(kind, id, 500)
  return sendCsv(event, `history-${kind}-${id.slice(0, 8)}.csv`, csvText(HISTORY_CSV_COLUMNS, historyCsvRows(items)))
})
