import type { FitReason, ReasonParams } from '#shared/utils/battery-fit'
import type { Language } from '#shared/utils/languages'
import { LANGUAGE_TAGS, isLanguage } from '#shared/utils/languages'
import { keptDateFormat } from '#shared/utils/intl-formats'
import { storedUnitParam, type UnitSystem } from '#shared/utils/units'
import en from '../../i18n/locales/en.json'
import enLead from '../../i18n/lead/en.json'
import es from '../../i18n/locales/es.json'

// E-mail words in the recipient's language, from the same locale files the screens read (mail.*, refusal.*):
// the person's `users.language`, English when they have none. Values in stored units (`over_lb`) are written
// in the site's units, as on the screen.

type Tree = { [key: string]: string | Tree }
const MESSAGES: Record<Language, Tree> = { en: { ...en, ...enLead }, es }

/** One message by dotted key with {named} parameters; the English words when this language lacks the key. */
export type MailT = (key: string, params?: Record<string, string | number>) => string

function lookup(tree: Tree, key: string): string | undefined {
  let node: string | Tree | undefined = tree
  for (const part of key.split('.')) node = typeof node === 'object' ? node[part] : undefined
  return typeof node === 'string' ? node : undefined
}

export function mailLanguage(setting: string | null | undefined): Language {
  return isLanguage(setting) ? setting : 'en'
}

/**
 * `groupCounts`: the count `{n}` written as the language groups digits ("5,002"), for pages where every `n` is a count (reports).
 * `days`: a parameter that is a calendar day ('2026-12-03') written as the language writes a date (e-mails).
 */
export function mailWords(language: string | null | undefined, { groupCounts = false, days = false } = {}): MailT {
  const lang = mailLanguage(language)
  const tree = MESSAGES[lang]
  const day = days ? mailDay(lang) : null
  return (key, params = {}) => {
    const text = lookup(tree, key) ?? lookup(MESSAGES.en, key) ?? key
    // the singular of a "one | many" message unless the count says otherwise
    const plural = text.split(' | ')
    const chosen = plural.length === 2 ? plural[typeof params.n === 'number' && params.n !== 1 ? 1 : 0]! : text
    const shown = (name: string) => (groupCounts && name === 'n' && typeof params.n === 'number'
      ? params.n.toLocaleString(LANGUAGE_TAGS[lang])
      : day && typeof params[name] === 'string' ? day(params[name]) : String(params[name]))
    return chosen.replace(/\{(\w+)\}/g, (whole, name: string) => (name in params ? shown(name) : whole))
  }
}

/** A calendar day ('2026-12-03') as the recipient's language writes a date ("Dec 3, 2026", "3 dic 2026"); other text as given. */
export type MailDay = (isoDay: string) => string
export function mailDay(language: string | null | undefined): MailDay {
  const format = keptDateFormat(LANGUAGE_TAGS[mailLanguage(language)], { dateStyle: 'medium', timeZone: 'UTC' })
  return isoDay => (/^\d{4}-\d{2}-\d{2}$/.test(isoDay) ? format.format(new Date(`${isoDay}T12:00:00Z`)) : isoDay)
}

/** A coded reason in the recipient's words; the server's English when the language has no words for its code. */
export function mailReason(t: MailT, reason: FitReason, units: UnitSystem): string {
  const key = `refusal.${reason.code}${typeof reason.params?.variant === 'string' ? `_${reason.params.variant}` : ''}`
  if (!lookup(MESSAGES.en, key)) return reason.message
  const said = mailCoded(t, key, reason.params, units)
  // a reason stored without a number its words need ("{minutes} min left") reads as it was recorded
  return /\{\w+\}/.test(said) ? reason.message : said
}

/** One coded message (refusal, history line) with its parameters named as the screen names them, in `units`. */
export function mailCoded(t: MailT, key: string, given: ReasonParams = {}, units: UnitSystem): string {
  const params: Record<string, string | number> = {}
  for (const [name, value] of Object.entries(given)) {
    const stored = typeof value === 'number' ? storedUnitParam(name, value, units) : null
    if (stored) params[stored[0]] = stored[1]
    else if (Array.isArray(value)) params[name] = value.map(v => (name === 'items' ? t(`refill.item.${v}`) : t(`chemistry.${v}`))).join(name === 'items' ? '; ' : ', ')
    else if (typeof value === 'string' && lookup(MESSAGES.en, `reason_word.${name}.${value}`)) params[name] = t(`reason_word.${name}.${value}`)
    else params[name] = value
  }
  return t(key, params)
}
