import type { H3Event } from 'h3'

const NOT_FOUND = 'No tag with that code at your sites. Check the code on the label and type it again.'

// A tag code (as typed or scanned) to its asset, among the user's sites. Unknown codes and codes of
// sites the user cannot see get the same 404, so a code's existence does not leak.
export async function resolveTagForActor(event: H3Event, raw: string) {
  const code = normalizeTagCode(raw)
  const actor = await requireActor(event)
  if (!code) throw createError({ statusCode: 404, message: NOT_FOUND })
  const db = useDb()
  const [tag] = await db.select().from(tables.tags).where(eq(tables.tags.code, code))
  if (!tag || !actor.siteIds.includes(tag.siteId)) throw createError({ statusCode: 404, message: NOT_FOUND })
  const { row, tagCode } = await findAssetForActor(event, tag.assetKind, tag.assetId)
  return { actor, tag, kind: tag.assetKind, row, liveCode: tagCode }
}
