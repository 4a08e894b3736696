import { randomBytes } from 'node:crypto'

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
export default defineEventHandler((event) => {
  const nonce = randomBytes(16).toString('base64')
  event.context.cspNonce = nonce
  const secure = getRequestProtocol(event, { xForwardedProto: process.env.BAYWARD_TRUST_PROXY === '1' }) === 'https'
  setResponseHeaders(event, {
    'content-security-policy': [
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
    ].join('; '),
    'x-content-type-options': 'nosniff',
    'x-frame-options': 'DENY',
    'referrer-policy': 'same-origin',
    'permissions-policy': 'camera=(self), microphone=(), geolocation=()',
    'cross-origin-opener-policy': 'same-origin',
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
  if (length > limit) throw createError({ statusCode: 413, message: `The request is too large (limit ${Math.round(limit / 1024)} kB).` })
})
