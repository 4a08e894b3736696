// Postgres error codes inside drizzle's wrapped errors.
export function pgErrorCode(error: unknown): string | undefined {
  let e: unknown = error
  for (let i = 0; i < 3 && e; i++) {
    const code = (e as { code?: unknown }).code
    if (typeof code === 'string' && /^[0-9A-Z]{5}$/.test(code)) return code
    e = (e as { cause?: unknown }).cause
  }
  return undefined
}

export function pgConstraint(error: unknown): string | undefined {
  let e: unknown = error
  for (let i = 0; i < 3 && e; i++) {
    const name = (e as { constraint_name?: unknown }).constraint_name
    if (typeof name === 'string') return name
    e = (e as { cause?: unknown }).cause
  }
  return undefined
}

export const isUniqueViolation = (error: unknown) => pgErrorCode(error) === '23505'
