import { z } from 'zod'

const QuerySchema = z.object({ siteId: z.uuid('Pick a site.') })

// Counts for a site's home page: assets by kind and how many are out of service.
export default defineAbilityHandler('site.member', async (event) => {
  const { siteId } = validateQuery(event, QuerySchema)
  await requireAbility(event, 'site.member', siteId)
  const [row] = await useDb().execute<Record<string, number>>(sql`
    SELECT
      (SELECT count(*) FROM trucks WHERE site_id = ${siteId})::int AS trucks,
      (SELECT count(*) FROM batteries WHERE site_id = ${siteId})::int AS batteries,
      (SELECT count(*) FROM chargers WHERE site_id = ${siteId})::int AS chargers,
      (SELECT count(*) FROM lp_cylinders WHERE site_id = ${siteId})::int AS cylinders,
      (SELECT count(*) FROM areas WHERE site_id = ${siteId})::int AS areas,
      ((SELECT count(*) FROM trucks WHERE site_id = ${siteId} AND out_of_service)
       + (SELECT count(*) FROM batteries WHERE site_id = ${siteId} AND out_of_service)
       + (SELECT count(*) FROM chargers WHERE site_id = ${siteId} AND out_of_service)
       + (SELECT count(*) FROM lp_cylinders WHERE site_id = ${siteId} AND out_of_service))::int AS "outOfService"`)
  return row
})
