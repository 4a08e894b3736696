import type { z } from 'zod'

/** Field messages keyed by dotted path ('hourMeter', 'cells.3.specificGravity'), the first message per field. */
export function fieldMessages(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {}
  for (const issue of error.issues) {
    const key = issue.path.join('.') || '_'
    fields[key] ??= issue.message
  }
  return fields
}
