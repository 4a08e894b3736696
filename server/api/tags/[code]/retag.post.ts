import { z } from 'zod'

const ParamsSchema = z.object({ code: z.string().min(1).max(200) })
const BodySchema = z.object({ reason: z.string().trim().min(3, 'Say why (label lost, damaged…).').max(300) })

// Re-tag an asset whose label is lost or damaged: the old code is retired (it still resolves and
// says it was replaced) and a new one issued (leads and admins).
export default defineAbilityHandler('tag.retag', async (event) => {
  const { code } = validateParams(event, ParamsSchema)
  const body = await validateBody(event, BodySchema)
  const { actor, tag, kind, row } = await resolveTagForActor(event, code)
  requireActorCan(actor, 'tag.retag', row.siteId)
  if (tag.retiredAt) throw codedError(409, 'tag_replaced', `${tag.code} was already replaced; re-tag its current code instead.`, { params: { code: tag.code } })
  return useDb().transaction(async (tx) => {
    const [retired] = await tx.update(tables.tags).set({ retiredAt: new Date() })
      .where(and(eq(tables.tags.id, tag.id), isNull(tables.tags.retiredAt))).returning()
    if (!retired) throw codedError(409, 'retag_same_moment', 'Someone re-tagged this asset at the same moment; reload.')
    const newCode = await issueTag(tx, kind, row.id, row.siteId)
    await tx.update(tables.tags).set({ replacedByCode: newCode }).where(eq(tables.tags.id, tag.id))
    await recomputeSubjects(tx, row.siteId, [{ kind, id: row.id }])
    await writeAudit(tx, { actor, siteId: row.siteId, action: 'retag', entity: kind, entityId: row.id, before: { code: tag.code }, after: { code: newCode }, note: `${tag.code} → ${newCode}: ${body.reason}` })
    setResponseStatus(event, 201)
    return { code: newCode, retired: tag.code }
  })
})
