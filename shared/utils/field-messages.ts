import type { z } from 'zod'

/** Words for one zod issue in another language; undefined keeps the schema's own (English) message. */
export type IssueWords = (issue: z.core.$ZodIssue) => string | undefined

/**
 * What a 400 answer says of one field's issue beside its English message (`data.issues`): the zod code and the
 * plain values a screen words it from.
 */
export interface SentIssue { code: string, origin?: string, minimum?: number, maximum?: number, expected?: string, format?: string }

/** A zod issue's plain values, or a sent issue read back from an answer (no zod at run time here: the floor's first page loads without the schema library). */
export function readSentIssue(value: unknown): SentIssue | undefined {
  const given = value as Record<string, unknown> | null
  if (!given || typeof given !== 'object' || typeof given.code !== 'string') return undefined
  const sent: SentIssue = { code: given.code }
  for (const k of ['origin', 'expected', 'format'] as const) if (typeof given[k] === 'string') sent[k] = given[k]
  for (const k of ['minimum', 'maximum'] as const) {
    const n = typeof given[k] === 'bigint' ? Number(given[k]) : given[k]
    if (typeof n === 'number' && Number.isFinite(n)) sent[k] = n
  }
  return sent
}

/**
 * The one rule that names a field by its issue's path: the dotted path from the body's top ('hourMeter',
 * 'settings.coolDownMinutes', 'cells.3.specificGravity'), '_' for the whole. The server keys `data.fields` and
 * `data.issues` by it, and a form keys its own check's messages by it, so both land at the same field.
 */
export function fieldKey(path: readonly PropertyKey[]): string {
  return path.map(String).join('.') || '_'
}

// The first issue per field, keyed by fieldKey.
function firstIssues(error: z.ZodError): Map<string, z.core.$ZodIssue> {
  const first = new Map<string, z.core.$ZodIssue>()
  for (const issue of error.issues) {
    const key = fieldKey(issue.path)
    if (!first.has(key)) first.set(key, issue)
  }
  return first
}

/**
 * Field messages keyed by dotted path ('hourMeter', 'cells.3.specificGravity'), the first message per field.
 * With `words`, a screen in another language says each issue in its own words from the issue's code and
 * limits (one schema for server and client; the schema's English stays the server's and the fallback).
 */
export function fieldMessages(error: z.ZodError, words?: IssueWords): Record<string, string> {
  return Object.fromEntries([...firstIssues(error)].map(([key, issue]) => [key, words?.(issue) ?? issue.message]))
}

/** The code and limits of each field's first issue, same keys as `fieldMessages` (only plain values: JSON-safe). */
export function fieldIssues(error: z.ZodError): Record<string, SentIssue> {
  return Object.fromEntries([...firstIssues(error)].map(([key, issue]) => [key, readSentIssue(issue)!]))
}

/**
 * A server's field messages in the reader's words: each field whose issue the server sent is said by `words`
 * (issueWordsFor, as for the issues the client finds itself); a check with its own rule (custom), an issue the
 * words do not know, or no words (English) keeps the server's message.
 */
export function sentFieldMessages(fields: Record<string, string>, issues: Record<string, SentIssue>, words?: IssueWords): Record<string, string> {
  if (!words) return fields
  return Object.fromEntries(Object.entries(fields).map(([key, message]) => {
    const sent = Object.hasOwn(issues, key) ? issues[key] : undefined
    // too_small / too_big are worded from their limit: without one, the server's words stay
    const limitless = (sent?.code === 'too_small' && sent.minimum === undefined) || (sent?.code === 'too_big' && sent.maximum === undefined)
    const issue = sent && !limitless ? { ...sent, path: key === '_' ? [] : key.split('.'), message } as z.core.$ZodIssue : undefined
    return [key, (issue && words(issue)) ?? message]
  }))
}
