import type { H3Event } from 'h3'
import type { z } from 'zod'
import type { ReasonParams } from '#shared/utils/battery-fit'

// Every 400 answer carries its field messages in `data.fields` (fieldMessages, shared/utils/field-messages.ts)
// and the code `check_fields`, which a screen says in the reader's words (refusal.check_fields).
export function checkFieldsError(fields: Record<string, string>, message = 'Check the highlighted fields.') {
  return createError({ statusCode: 400, message, data: { code: 'check_fields', fields } })
}

function invalid(error: z.ZodError, what: string) {
  const fields = fieldMessages(error)
  const first = Object.entries(fields)[0]
  return checkFieldsError(fields, first ? `Check ${what}: ${first[0] === '_' ? '' : `${first[0]} — `}${first[1]}` : `Check ${what}.`)
}

// PostgreSQL text cannot hold U+0000, so input carrying one is refused here rather than failing in a query.
function nulCharacterPath(value: unknown, path: string[] = []): string | undefined {
  if (typeof value === 'string') return value.includes('\u0000') ? path.join('.') || '_' : undefined
  if (value && typeof value === 'object') {
    for (const [key, inner] of Object.entries(value)) {
      const found = key.includes('\u0000') ? [...path, key].join('.') : nulCharacterPath(inner, [...path, key])
      if (found) return found
    }
  }
  return undefined
}

function refuseNulCharacters(input: unknown) {
  const path = nulCharacterPath(input)
  if (path) throw createError({ statusCode: 400, message: 'Text cannot contain a NUL character.', data: { fields: { [path]: 'Contains a character that cannot be stored.' } } })
}

export async function validateBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  let body: unknown
  try {
    body = await readBody(event)
  }
  catch {
    throw createError({ statusCode: 400, message: 'The request body is not valid JSON.' })
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
  if (!result.success) throw createError({ statusCode: 404, message: 'Not found.' })
  return result.data
}

/**
 * A refusal the floor pages show in the reader's words: `code` names `refusal.<code>` in every locale file,
 * `params` its numbers and names (values with a unit in the stored unit, suffixed), `message` the English
 * fallback, repeated at each named field.
 */
export function codedError(statusCode: number, code: string, message: string, { params, fields = [] }: { params?: ReasonParams, fields?: string[] } = {}) {
  return createError({
    statusCode, message,
    data: { code, ...(params ? { params } : {}), ...(fields.length ? { fields: Object.fromEntries(fields.map(f => [f, message])) } : {}) },
  })
}
