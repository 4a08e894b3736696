import { z } from 'zod'
import { ASSET_KINDS } from '#shared/utils/asset-schemas'

const ParamsSchema = z.object({ kind: z.enum(ASSET_KINDS), id: z.uuid() })
const QuerySchema = z.object({ limit: z.coerce.number().int().min(1).max(500).default(100) })

// The asset's timeline: every edit and event, newest first, with who and when; corrections beside the
// rows they replace, and which rows the person may correct now; `more` when earlier events were left out.
export default defineAbilityHandler('site.member', async (event) => {
  const { kind, id } = validateParams(event, ParamsSchema)
  const { limit } = validateQuery(event, QuerySchema)
  const { actor, row } = await findAssetForActor(event, kind, id)
  // one more than asked, to tell whether earlier events were left out (the page then points to the CSV)
  const timeline = await assetTimeline(kind, id, limit + 1)
  return { items: await correctableTimeline(actor, row.siteId, timeline.slice(0, limit)), more: timeline.length > limit }
})
