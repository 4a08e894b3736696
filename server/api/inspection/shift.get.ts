import { z } from 'zod'
import type { ShiftInspectionStatus } from '#shared/types/inspection'

const querySchema = z.object({ siteId: z.uuid('Pick a site.') })

// This shift's pre-shift checks at a site: trucks used today and not checked since the shift began, trucks on hold with their age.
export default defineAbilityHandler('site.member', async (event): Promise<ShiftInspectionStatus> => {
  const { siteId } = validateQuery(event, querySchema)
  const actor = await requireAbility(event, 'site.member', siteId)
  return cachedForSite(actor, siteId, 'inspection-shift', 30_000, () => shiftInspectionStatus(useDb(), siteId))
})
