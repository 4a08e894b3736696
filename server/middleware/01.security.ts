import { randomBytes } from 'node:crypto'
import type { IncomingMessage } from 'node:http'

const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])
// Request bodies over these sizes are refused before they are read (bytes).
// File uploads (multipart) get room for a 10 MB file; CSV imports for a 5 MB file; other JSON 256 kB.
const UPLOAD_LIMIT = 11 * 1024 * 1024
const BODY_LIMITS: [RegExp, number][] = [
  [/\/import$/, 6 * 1024 * 1024],
]
const DEFAULT_LIMIT = 256 * 1024

// Security headers on every response, a per-request script nonce for the content security policy,
// cross-site refusal for state-changing routes, and early refusal of oversized bodies.
const PAGE_POLICY = (nonce: string) => [
  `default-src 'self'`,
  `script-src 'self' 'nonce-${nonce}'`,
  `style-src 'self' 'unsafe-inline'`,
  `img-src 'self' data: blob:`,
  `font-src 'self' data:`,
  `connect-src 'self'`,
  `media-src 'self' blob:`,
  `worker-src 'self' blob:`,
  `object-src 'none'`,
  `base-uri 'self'`,
  `form-action 'self'`,
  `frame-ancestors 'none'`,
].join('; ')
// JSON and CSV answers run nothing and embed nothing; uploaded files keep the page policy, so a PDF
// certificate still opens in the browser's viewer.
const API_POLICY = `default-src 'none'; script-src 'none'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'`
const COMMON_HEADERS = {
  'x-content-type-options': 'nosniff',
  'x-frame-options': 'DENY',
  'referrer-policy': 'same-origin',
  'permissions-policy': 'camera=(self), microphone=(), geolocation=()',
  'cross-origin-opener-policy': 'same-origin',
}

export default defineEventHandler(async (event) => {
  const api = event.path.startsWith('/api/') && !event.path.startsWith('/api/uploads/')
  let policy = API_POLICY
  if (!api) {
    const nonce = randomBytes(16).toString('base64')
    event.context.cspNonce = nonce
    policy = PAGE_POLICY(nonce)
  }
  const secure = getRequestProtocol(event, { xForwardedProto: process.env.BAYWARD_TRUST_PROXY === '1' }) === 'https'
  setResponseHeaders(event, {
    'content-security-policy': policy,
    ...COMMON_HEADERS,
    ...(secure ? { 'strict-transport-security': 'max-age=31536000; includeSubDomains' } : {}),
  })

  if (!STATE_CHANGING.has(event.method)) return
  const path = event.path.split('?')[0] ?? ''
  const site = getRequestHeader(event, 'sec-fetch-site')
  const origin = getRequestHeader(event, 'origin')
  const trustProxy = process.env.BAYWARD_TRUST_PROXY === '1'
  const host = (trustProxy && getRequestHeader(event, 'x-forwarded-host')) || getRequestHeader(event, 'host')
  let foreignOrigin = origin === 'null'
  if (origin && origin !== 'null') {
    try {
      foreignOrigin = new URL(origin).host !== host
    }
    catch {
      foreignOrigin = true
    }
  }
  if (site === 'cross-site' || foreignOrigin) {
    throw createError({ statusCode: 403, message: 'Requests from other sites are refused.' })
  }
  const length = Number(getRequestHeader(event, 'content-length') ?? 0)
  const multipart = (getRequestHeader(event, 'content-type') ?? '').startsWith('multipart/form-data')
  const limit = multipart ? UPLOAD_LIMIT : BODY_LIMITS.find(([re]) => re.test(path))?.[1] ?? DEFAULT_LIMIT
  const tooLarge = () => codedError(413, 'request_too_large', `The request is too large (limit ${Math.round(limit / 1024)} kB).`, { params: { kb: Math.round(limit / 1024) } })
  if (length > limit) throw tooLarge()
  // A chunked body says no length up front: it is read here, counting, and refused as soon as it passes the
  // limit; the route then reads the bytes kept here (h3 looks for them under this symbol).
  if (!getRequestHeader(event, 'content-length') && /\bchunked\b/i.test(getRequestHeader(event, 'transfer-encoding') ?? '')) {
    const body = await readWithin(event.node.req, limit).catch((error: unknown) => {
      if (error === OVER_LIMIT) {
        setResponseHeader(event, 'connection', 'close')
        throw tooLarge()
      }
      throw codedError(400, 'body_unreadable', 'The request body could not be read.')
    })
    ;(event.node.req as unknown as Record<symbol, unknown>)[Symbol.for('h3RawBody')] = Promise.resolve(body)
  }
})

const OVER_LIMIT = Symbol('over limit')

function readWithin(req: IncomingMessage, limit: number): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = []
    let size = 0
    const onData = (chunk: Buffer) => {
      size += chunk.length
      if (size <= limit) return chunks.push(chunk)
      req.off('data', onData)
      req.resume() // the rest is read and dropped while the 413 goes out
      reject(OVER_LIMIT)
    }
    req.on('data', onData)
    req.once('end', () => resolve(Buffer.concat(chunks)))
    req.once('error', reject)
  })
}
