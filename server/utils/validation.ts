import { createError, type H3Event } from 'h3'
import type { z } from 'zod'
import type { ReasonParams } from '#shared/utils/battery-fit'
import type { SentIssue } from '#shared/utils/field-messages'

// Every 400 answer carries its field messages in `data.fields` (fieldMessages, shared/utils/field-messages.ts)
// and the code `check_fields`, which a screen says in the reader's words (refusal.check_fields). Beside the
// English, `data.issues` gives each field's issue code and limits (fieldIssues), from which a screen in another
// language words the field (sentFieldMessages).
export function checkFieldsError(fields: Record<string, string>, message = 'Check the highlighted fields.', issues?: Record<string, SentIssue>) {
  return createError({ statusCode: 400, message, data: { code: 'check_fields', fields, ...(issues ? { issues } : {}) } })
}

/** A schema's refusal as a 400: each field's message and issue; `at` (a dotted path) when the schema read a part of the input. */
export function schemaFieldsError(error: z.ZodError, message?: string, at = '') {
  const key = (k: string) => (!at ? k : k === '_' ? at : `${at}.${k}`)
  const under = <T>(record: Record<string, T>) => Object.fromEntries(Object.entries(record).map(([k, v]) => [key(k), v]))
  return checkFieldsError(under(fieldMessages(error)), message, under(fieldIssues(error)))
}

function invalid(error: z.ZodError, what: string) {
  const first = Object.entries(fieldMessages(error))[0]
  return schemaFieldsError(error, first ? `Check ${what}: ${first[0] === '_' ? '' : `${first[0]} — `}${first[1]}` : `Check ${what}.`)
}

// PostgreSQL text cannot hold U+0000, so input carrying one is refused here rather than failing in a query.
function nulCharacterPath(value: unknown, path: string[] = []): string | undefined {
  if (typeof value === 'string') return value.includes('\u0000') ? fieldKey(path) : undefined
  if (value && typeof value === 'object') {
    for (const [key, inner] of Object.entries(value)) {
      const found = key.includes('\u0000') ? fieldKey([...path, key]) : nulCharacterPath(inner, [...path, key])
      if (found) return found
    }
  }
  return undefined
}

function refuseNulCharacters(input: unknown) {
  const path = nulCharacterPath(input)
  if (path) throw checkFieldsError({ [path]: 'Contains a character that cannot be stored.' }, 'Text cannot contain a NUL character.', { [path]: { code: 'invalid_format' } })
}

export async function validateBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  let body: unknown
  try {
    body = await readBody(event)
  }
  catch {
    throw codedError(400, 'body_unreadable', 'The request body is not valid JSON.')
  }
  refuseNulCharacters(body)
  const result = schema.safeParse(body ?? {})
  if (!result.success) throw invalid(result.error, 'the form')
  return result.data
}

export function validateQuery<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  const query = getQuery(event)
  refuseNulCharacters(query)
  const result = schema.safeParse(query)
  if (!result.success) throw invalid(result.error, 'the query')
  return result.data
}

export function validateParams<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  const result = schema.safeParse(getRouterParams(event, { decode: true }))
  if (!result.success) throw codedError(404, 'not_found', 'Not found.')
  return result.data
}

/**
 * A refusal the floor pages show in the reader's words: `code` names `refusal.<code>` in every locale file,
 * `params` its numbers and names (values with a unit in the stored unit, suffixed), `message` the English
 * fallback, repeated at each named field (or, given field → words, each field's own English words).
 * `fieldCodes` names a field's own problem where fields differ (two weights wrong in two ways): each field is
 * then said from its own code, the summary from `code`.
 */
export function codedError(statusCode: number, code: string, message: string, { params, fields = [], fieldCodes }: { params?: ReasonParams, fields?: string[] | Record<string, string>, fieldCodes?: Record<string, FieldCode> } = {}) {
  const named = Array.isArray(fields) ? Object.fromEntries(fields.map(f => [f, message])) : fields
  return createError({
    statusCode, message,
    data: { code, ...(params ? { params } : {}), ...(Object.keys(named).length ? { fields: named } : {}), ...(fieldCodes ? { fieldCodes } : {}) },
  })
}

/** One field's own coded problem (`refusal.<code>`, with its params). */
export interface FieldCode { code: string, params?: ReasonParams }
