import { z } from 'zod'
import { DEFAULT_CHECKLIST_ITEMS, DEFAULT_CHECKLIST_TITLES, type ChecklistAreaKind, type ChecklistCadence } from '#shared/utils/area-checklists'

const QuerySchema = z.object({ siteId: z.uuid() })

// The site's checklists in use (or the defaults a first log will start from), per area kind and cadence.
export default defineAbilityHandler('log.view', async (event) => {
  const { siteId } = validateQuery(event, QuerySchema)
  const actor = await requireAbility(event, 'log.view', siteId)
  const db = useDb()
  const items = []
  for (const areaKind of ['charging_area', 'fuel_station'] as ChecklistAreaKind[]) {
    for (const cadence of ['daily', 'weekly'] as ChecklistCadence[]) {
      const t = await activeTemplate(db, siteId, areaKind, cadence)
      items.push(t
        ? { id: t.id, areaKind, cadence, title: t.title, items: t.items, version: t.version, inUse: true }
        : { id: null, areaKind, cadence, title: DEFAULT_CHECKLIST_TITLES[areaKind][cadence], items: cadence === 'daily' ? [...DEFAULT_CHECKLIST_ITEMS[areaKind]] : [], version: 0, inUse: false })
    }
  }
  return { items, canEdit: actorCan(actor, 'checklist.edit', siteId) }
})
