import { z } from 'zod'

const ParamsSchema = z.object({ code: z.string().min(1).max(200) })
const QuerySchema = z.object({ format: z.enum(['svg', 'png']).default('svg') })

// The QR symbol of a live tag (it encodes <public base URL>/t/<code>), as SVG or PNG.
export default defineAbilityHandler('site.member', async (event) => {
  const { code } = validateParams(event, ParamsSchema)
  const { format } = validateQuery(event, QuerySchema)
  const { liveCode } = await resolveTagForActor(event, code)
  const url = tagUrlFor(liveCode ?? code)
  setHeader(event, 'cache-control', 'private, max-age=3600')
  if (format === 'png') {
    setHeader(event, 'content-type', 'image/png')
    return qrPng(url)
  }
  setHeader(event, 'content-type', 'image/svg+xml')
  return qrSvg(url)
})
