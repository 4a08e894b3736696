import type { H3Event } from 'h3'
import { LANGUAGES, isLanguage, type Language } from '#shared/utils/languages'

// The language the server writes a reader's words in (reports, the audit pack): the one the page asked for,
// else the person's setting (users.language), else the first of the browser's Accept-Language Bayward has.
export async function readerLanguage(event: H3Event, userId: string, asked?: Language | null): Promise<Language> {
  if (asked) return asked
  const [row] = await useDb().select({ language: tables.users.language }).from(tables.users).where(eq(tables.users.id, userId))
  if (isLanguage(row?.language)) return row.language
  const tags = (getRequestHeader(event, 'accept-language') ?? '').split(',').map(part => part.split(';')[0]!.trim().slice(0, 2).toLowerCase())
  return tags.find(isLanguage) ?? LANGUAGES[0]
}
