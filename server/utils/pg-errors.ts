import { checkFieldsError, codedError } from './validation'

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

const realCalendarDate = (s: string) => {
  const d = new Date(`${s}T00:00:00Z`)
  return Number(s.slice(0, 4)) >= 1 && !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s
}

// A value the schema let through but PostgreSQL refuses (data exception, SQLSTATE class 22) is bad input, a
// 400: an impossible date such as 2024-02-30 at each date field at fault, with the issue a schema gives a
// date written wrong (invalid_format, date); anything else as the coded value_unstorable.
export function unstorableValueError(error: unknown, values: Record<string, unknown>) {
  if (!pgErrorCode(error)?.startsWith('22')) return undefined
  const dates = Object.entries(values).flatMap(([key, value]) =>
    typeof value === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(value) && !realCalendarDate(value) ? [key] : [])
  if (!dates.length) return codedError(400, 'value_unstorable', 'A value cannot be stored.')
  return checkFieldsError(Object.fromEntries(dates.map(k => [k, 'Not a real date.'])), undefined,
    Object.fromEntries(dates.map(k => [k, { code: 'invalid_format', format: 'date' }])))
}
