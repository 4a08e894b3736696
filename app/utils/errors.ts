// The message a route answered with ($fetch error), or a fallback.
export function errorMessage(error: unknown, fallback = 'Something went wrong. Try again.'): string {
  const e = error as { data?: { message?: string }, statusMessage?: string, message?: string, statusCode?: number }
  if (e?.statusCode === undefined && e?.message?.includes('fetch')) return 'No connection to Bayward. Check the network and try again.'
  return e?.data?.message || e?.statusMessage || fallback
}

// Field messages of a 400 answer, keyed by field name (read by the one refusal parser, refusal.ts).
export function errorFields(error: unknown): Record<string, string> {
  return parseRefusal(error)?.fields ?? {}
}
