/**
 * A version-4 UUID for a record's retry key. crypto.randomUUID exists only in a secure context (HTTPS or
 * localhost); a tablet on the warehouse LAN over plain HTTP has crypto.getRandomValues only.
 */
export function newIdempotencyKey(): string {
  const b = crypto.getRandomValues(new Uint8Array(16))
  b[6] = (b[6]! & 0x0f) | 0x40
  b[8] = (b[8]! & 0x3f) | 0x80
  const h = [...b].map(x => x.toString(16).padStart(2, '0')).join('')
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`
}
