/** The languages Bayward is written in; the first is the fallback. */
export const LANGUAGES = ['en', 'es'] as const
export type Language = (typeof LANGUAGES)[number]

/** Each language's name in itself, for the picker. */
export const LANGUAGE_NAMES: Record<Language, string> = { en: 'English', es: 'Español' }

/** The regional form each language is written in: US English and US Spanish (1,850.5 and 12-hour clock in both). */
export const LANGUAGE_TAGS: Record<Language, string> = { en: 'en-US', es: 'es-US' }

export function isLanguage(value: unknown): value is Language {
  return typeof value === 'string' && (LANGUAGES as readonly string[]).includes(value)
}
