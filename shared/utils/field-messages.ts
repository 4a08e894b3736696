import type { z } from 'zod'

/** Words for one zod issue in another language; undefined keeps the schema's own (English) message. */
export type IssueWords = (issue: z.core.$ZodIssue) => string | undefined

/**
 * Field messages keyed by dotted path ('hourMeter', 'cells.3.specificGravity'), the first message per field.
 * With `words`, a screen in another language says each issue in its own words from the issue's code and
 * limits (one schema for server and client; the schema's English stays the server's and the fallback).
 */
export function fieldMessages(error: z.ZodError, words?: IssueWords): Record<string, string> {
  const fields: Record<string, string> = {}
  for (const issue of error.issues) {
    const key = issue.path.join('.') || '_'
    fields[key] ??= words?.(issue) ?? issue.message
  }
  return fields
}
