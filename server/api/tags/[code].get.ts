import { z } from 'zod'

const ParamsSchema = z.object({ code: z.string().min(1).max(200) })

// What a scanned tag opens: the asset, its state in words, what is due, the user's roles. The last events
// come from the history route, so the state and actions answer first.
export default defineAbilityHandler('site.member', async (event) => {
  const { code } = validateParams(event, ParamsSchema)
  const { actor, view } = await tagViewForActor(event, code, async () => {
    const { tag, kind, row, liveCode } = await resolveTagForActor(event, code)
    const status = await assetStatus(kind, row)
    return {
      code: tag.code,
      retired: tag.retiredAt !== null,
      replacedBy: tag.retiredAt ? liveCode : null,
      liveCode,
      kind,
      asset: { id: row.id, siteId: row.siteId, title: assetTitle(kind, row), identity: assetIdentity(kind, row), facts: identityFacts(kind, row), outOfService: !!row.outOfService, outOfServiceReason: row.outOfServiceReason ?? null, chemistry: kind === 'battery' ? String(row.chemistry) : null },
      status,
    }
  })
  return { ...view, roles: rolesAt(actor, view.asset.siteId) }
})
