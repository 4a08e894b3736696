import { INCIDENT_KIND_LABELS, type IncidentInput } from '#shared/utils/incidents'
import type { Actor } from '../auth'

/** Everyone at a site may report an incident; leads read the list. */

// An incident report: the asset by its tag code, photos already uploaded to the site, a follow-up for
// its owner, and an alert to the safety leads (and the owner) in the same transaction.
export async function reportIncident(actor: Actor, input: IncidentInput) {
  const db = useDb()
  const at = input.at ? new Date(input.at) : new Date()
  if (at.getTime() > Date.now() + 5 * 60_000) throw badField('at', 'time_in_future', 'That time is in the future.')
  let area: typeof tables.areas.$inferSelect | null = null
  if (input.areaId) {
    area = (await db.select().from(tables.areas).where(and(eq(tables.areas.id, input.areaId), eq(tables.areas.siteId, input.siteId))))[0] ?? null
    if (!area) throw badField('areaId', 'area_missing', 'Pick an area at this site.')
  }
  let asset: { kind: typeof tables.tags.$inferSelect['assetKind'], id: string, code: string } | null = null
  if (input.assetCode) {
    const code = normalizeTagCode(input.assetCode)
    const [tag] = code ? await db.select().from(tables.tags).where(and(eq(tables.tags.code, code), eq(tables.tags.siteId, input.siteId))) : []
    if (!tag) throw badField('assetCode', 'tag_not_at_site', 'No asset with that tag code at this site.')
    asset = { kind: tag.assetKind, id: tag.assetId, code: tag.code }
    if (!area && tag.assetKind === 'area') area = (await db.select().from(tables.areas).where(eq(tables.areas.id, tag.assetId)))[0] ?? null
  }
  if (input.followUpOwnerId) {
    const [member] = await db.select({ id: tables.memberships.id }).from(tables.memberships)
      .where(and(eq(tables.memberships.userId, input.followUpOwnerId), eq(tables.memberships.siteId, input.siteId))).limit(1)
    if (!member) throw badField('followUpOwnerId', 'person_missing', 'Pick someone at this site.')
  }
  if (input.photoUploadIds.length) {
    const photos = await db.select({ id: tables.uploads.id, contentType: tables.uploads.contentType }).from(tables.uploads)
      .where(and(inArray(tables.uploads.id, input.photoUploadIds), eq(tables.uploads.siteId, input.siteId)))
    if (photos.length !== new Set(input.photoUploadIds).size) throw badField('photoUploadIds', 'photos_again', 'Upload the photos again.')
  }
  const label = INCIDENT_KIND_LABELS[input.kind]
  const where = [area?.name, asset?.code].filter(Boolean).join(', ') || 'no place given'
  const result = await db.transaction(async (tx) => {
    const [row] = await tx.insert(tables.incidents).values({
      siteId: input.siteId, userId: actor.user.id, at, kind: input.kind, areaId: area?.id ?? null, assetKind: asset?.kind ?? null, assetId: asset?.id ?? null,
      description: input.description, immediateActions: input.immediateActions, followUpOwnerId: input.followUpOwnerId, photoUploadIds: input.photoUploadIds,
    }).returning()
    const [followUp] = await tx.insert(tables.followUps).values({
      siteId: input.siteId, source: 'incident', sourceId: row!.id, title: `${label} (${where})`.slice(0, 300), ownerUserId: input.followUpOwnerId,
      titleWords: where === 'no place given' ? { code: 'incident_nowhere', params: { kind: input.kind } } : { code: 'incident', params: { kind: input.kind, where } },
      openedOn: localDate(at, (await siteZone(tx, input.siteId))),
    }).returning()
    await recomputeSubjects(tx, input.siteId, [{ kind: 'follow_up', id: followUp!.id }], { lock: false })
    await writeAudit(tx, { actor, siteId: input.siteId, action: 'create', entity: 'incident', entityId: row!.id, after: row })
    await writeAudit(tx, { actor, siteId: input.siteId, action: 'create', entity: 'follow_up', entityId: followUp!.id, after: followUp })
    const base = (useRuntimeConfig().public.baseUrl as string) || 'http://localhost:3000'
    const mail = await queueAlert(tx, {
      siteId: input.siteId, kind: 'alert:incident', audience: 'notice.incident', userIds: input.followUpOwnerId ? [input.followUpOwnerId] : [],
      subject: `Incident: ${label} — ${where}`,
      body: `${actor.user.name} reported: ${label} at ${where}, ${at.toISOString().slice(0, 16).replace('T', ' ')} UTC.\n\nWhat happened:\n${input.description}\n\nImmediate actions:\n${input.immediateActions || '—'}\n\nPhotos: ${input.photoUploadIds.length}\n${new URL('/incidents', base).toString()}`,
    })
    return { item: row!, followUp: followUp!, alerted: mail.length }
  })
  deliverMailSoon()
  return result
}

async function siteZone(tx: Parameters<typeof writeAudit>[0], siteId: string): Promise<string> {
  const [s] = await tx.select({ timeZone: tables.sites.timeZone }).from(tables.sites).where(eq(tables.sites.id, siteId))
  return s?.timeZone ?? 'UTC'
}

export async function listIncidents(siteId: string, limit = 200) {
  const i = tables.incidents
  const rows = await useDb().select({
    item: i, reporter: tables.users.name, areaName: tables.areas.name,
    tagCode: sql<string | null>`(SELECT code FROM tags WHERE tags.asset_kind = ${i.assetKind} AND tags.asset_id = ${i.assetId} AND tags.retired_at IS NULL)`,
    owner: sql<string | null>`(SELECT name FROM users o WHERE o.id = ${i.followUpOwnerId})`,
    followUpClosedAt: sql<string | null>`(SELECT closed_at FROM follow_ups f WHERE f.source = 'incident' AND f.source_id = ${i.id} LIMIT 1)`,
  }).from(i).innerJoin(tables.users, eq(tables.users.id, i.userId)).leftJoin(tables.areas, eq(tables.areas.id, i.areaId))
    .where(eq(i.siteId, siteId)).orderBy(desc(i.at)).limit(limit)
  return rows.map(r => ({ ...r.item, reporter: r.reporter, areaName: r.areaName, tagCode: r.tagCode, ownerName: r.owner, followUpClosedAt: r.followUpClosedAt }))
}
