import type { H3Event } from 'h3'
import type { z } from 'zod'

// Field messages keyed by dotted path, the shape every 400 answer carries in `data.fields`.
export function fieldMessages(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {}
  for (const issue of error.issues) {
    const key = issue.path.join('.') || '_'
    fields[key] ??= issue.message
  }
  return fields
}

function invalid(error: z.ZodError, what: string) {
  const fields = fieldMessages(error)
  const first = Object.entries(fields)[0]
  return createError({
    statusCode: 400,
    message: first ? `Check ${what}: ${first[0] === '_' ? '' : `${first[0]} — `}${first[1]}` : `Check ${what}.`,
    data: { fields },
  })
}

export async function validateBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  let body: unknown
  try {
    body = await readBody(event)
  }
  catch {
    throw createError({ statusCode: 400, message: 'The request body is not valid JSON.' })
  }
  const result = schema.safeParse(body ?? {})
  if (!result.success) throw invalid(result.error, 'the form')
  return result.data
}

export function validateQuery<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  const result = schema.safeParse(getQuery(event))
  if (!result.success) throw invalid(result.error, 'the query')
  return result.data
}

export function validateParams<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  const result = schema.safeParse(getRouterParams(event, { decode: true }))
  if (!result.success) throw createError({ statusCode: 404, message: 'Not found.' })
  return result.data
}
