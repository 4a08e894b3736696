import type { H3Event } from 'h3'

const UNAVAILABLE_CODES = new Set([
  'ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'CONNECT_TIMEOUT', 'CONNECTION_CLOSED', 'CONNECTION_ENDED', 'CONNECTION_DESTROYED',
  // PostgreSQL: admin shutdown, crash shutdown, cannot connect now, connection failures
  '57P01', '57P02', '57P03', '08000', '08001', '08003', '08006',
])

function databaseUnavailable(error: unknown): boolean {
  let e: unknown = error
  for (let depth = 0; depth < 5 && e; depth++) {
    const code = (e as { code?: unknown }).code
    if (typeof code === 'string' && UNAVAILABLE_CODES.has(code)) return true
    e = (e as { cause?: unknown }).cause
  }
  return false
}

// Runs before Nuxt's own error handler: while the database is unreachable every request gets a
// quick 503 with a plain message instead of a 500; anything else falls through to Nuxt.
export default function bayErrorHandler(error: unknown, event: H3Event) {
  if (!databaseUnavailable(error)) return
  discardDbPool()
  const body = { statusCode: 503, statusMessage: 'Service Unavailable', message: 'Bayward cannot reach its database right now. Nothing from this request was saved; try again in a moment.' }
  setResponseStatus(event, 503, 'Service Unavailable')
  setResponseHeader(event, 'retry-after', 5)
  setResponseHeader(event, 'content-type', 'application/json')
  setResponseHeader(event, 'cache-control', 'no-store')
  event.node.res.end(JSON.stringify(body))
}
