import compression from 'compression'
import type { IncomingMessage, ServerResponse } from 'node:http'

/** JSON answers smaller than this go as they are: compressing them costs more than it saves (bytes). */
export const API_COMPRESS_THRESHOLD = 1024

// API answers in JSON above the threshold go brotli or gzip, as the browser asks (Accept-Encoding). Files
// (uploads, CSV, PDF) and the app's scripts and styles are not touched here: the build writes those
// precompressed (nitro.compressPublicAssets) and uploads are mostly compressed formats already.
const compress = compression({
  threshold: API_COMPRESS_THRESHOLD,
  filter: (_req: IncomingMessage, res: ServerResponse) => /^application\/json\b/.test(String(res.getHeader('content-type') ?? '')),
})

export default defineEventHandler((event) => {
  if (!event.path.startsWith('/api/')) return
  return new Promise<void>((resolve, reject) => compress(event.node.req as never, event.node.res as never, (error?: unknown) => (error ? reject(error) : resolve())))
})
