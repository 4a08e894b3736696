import { fuelSiteQuerySchema } from '#shared/utils/fuel-schemas'

// Upload a certificate or photo (PDF, JPEG or PNG, checked from its bytes) for a site; anyone at the
// site. The answer names the new upload; its bytes are fetched only through GET /api/uploads/:id.
export default defineAbilityHandler('upload.create', async (event) => {
  const { siteId } = validateQuery(event, fuelSiteQuerySchema)
  const actor = await requireAbility(event, 'upload.create', siteId)
  await refuseUploadRate(actor)
  const file = await readUploadedFile(event, 'file')
  const row = await storeUpload(actor, siteId, file)
  setResponseStatus(event, 201)
  return { item: publicUpload(row) }
})
