// An uploaded file, for signed-in users of its site only (others get 404). Sent with its checked type,
// nosniff and a sanitised name; ?download=1 saves it instead of showing it.
export default defineAbilityHandler('site.member', async (event) => {
  const { id } = validateParams(event, idParamsSchema)
  const { upload } = await findUploadForActor(event, id)
  const bytes = await readStoredFile(upload.storageKey)
  if (!bytes) throw codedError(404, 'file_missing', 'The file is missing from storage.')
  const disposition = getQuery(event).download === '1' ? 'attachment' : 'inline'
  const ascii = upload.displayName.replace(/[^\x20-\x7E]/g, '_').replace(/["\\]/g, '_')
  setResponseHeaders(event, {
    'content-type': upload.contentType,
    'content-length': upload.bytes,
    'content-disposition': `${disposition}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(upload.displayName)}`,
    'x-content-type-options': 'nosniff',
    'cache-control': 'private, no-store',
  })
  // Chromium does not show a PDF under a sandbox policy, so only images get one.
  if (upload.contentType !== 'application/pdf') setResponseHeader(event, 'content-security-policy', 'default-src \'none\'; img-src \'self\'; style-src \'unsafe-inline\'; sandbox')
  return bytes
})
