import { fuelSiteQuerySchema } from '#shared/utils/fuel-schemas'

// Upload a certificate or photo (PDF, JPEG or PNG, checked from its bytes) for a site; anyone at the
// site. The answer names the new upload; its bytes are fetched only through GET /api/uploads/:id.
export default defineEventHandler(async (event) => {
  const { siteId } = validateQuery(event, fuelSiteQuerySchema)
  const actor = await requireSiteRole(event, siteId)
  const file = await readUploadedFile(event, 'file')
  const row = await storeUpload(actor, siteId, file)
  setResponseStatus(event, 201)
  return { item: publicUpload(row) }
})
