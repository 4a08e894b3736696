import { z } from 'zod'
import { DEFAULT_INSPECTION_ITEMS, DEFAULT_INSPECTION_TITLES, INSPECTION_POWERS } from '#shared/utils/truck-inspection'

const querySchema = z.object({ siteId: z.uuid('Pick a site.') })

// The site's pre-shift checklists in use, one per power type (or the defaults a first check will start from), for the lead's editor.
export default defineAbilityHandler('inspection.template-edit', async (event) => {
  const { siteId } = validateQuery(event, querySchema)
  await requireAbility(event, 'inspection.template-edit', siteId)
  const db = useDb()
  const items = []
  for (const power of INSPECTION_POWERS) {
    const t = await activeInspectionTemplate(db, siteId, power)
    items.push(t
      ? { power, title: t.title, items: t.items, version: t.version, inUse: true }
      : { power, title: DEFAULT_INSPECTION_TITLES[power], items: [...DEFAULT_INSPECTION_ITEMS[power]], version: 0, inUse: false })
  }
  return { items }
})
