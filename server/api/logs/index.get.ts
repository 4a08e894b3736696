import { AREA_LOG_CAUTIONS, logViewQuerySchema, weekStartOf } from '#shared/utils/area-checklists'

// An area's log for a day or a week: the checklist, the entries that stand with their corrections,
// who signed it, and what the caller may do.
export default defineAbilityHandler('log.view', async (event) => {
  const query = validateQuery(event, logViewQuerySchema)
  const actor = await requireAbility(event, 'log.view', query.siteId)
  const db = useDb()
  const area = await areaAtSite(db, query.siteId, query.areaId)
  const site = await loadDueSite(db, query.siteId)
  const date = query.date ?? site.today
  const from = query.span === 'week' ? weekStartOf(date) : date
  const to = query.span === 'week' ? addCalendarInterval(from, 6, 'day') : date
  const days = await areaLogDays(db, query.siteId, area, from, to, query.cadence)
  return {
    area: { id: area.id, name: area.name, kind: area.kind },
    today: site.today,
    date,
    from,
    to,
    span: query.span,
    cadence: query.cadence,
    days,
    cautions: AREA_LOG_CAUTIONS[area.kind],
    canRecord: actorCan(actor, 'log.record', query.siteId),
    canSign: actorCan(actor, 'log.sign', query.siteId),
  }
})
