/**
 * BAYWARD_HEAP_GROWING_PERCENT read: how far the JavaScript heap may grow past what the last full garbage
 * collection kept before the next one (100: to twice that). 100 when unset; 0 leaves V8's own factor.
 */
export function heapGrowingPercent(raw: string | undefined): number {
  const text = raw?.trim() || '100'
  const percent = Number(text)
  if (!/^\d+$/.test(text) || percent > 1000) {
    throw new Error(`BAYWARD_HEAP_GROWING_PERCENT is "${raw}"; use a whole number from 0 (V8's own) to 1000.`)
  }
  return percent
}
