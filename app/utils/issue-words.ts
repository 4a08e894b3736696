import type { z } from 'zod'
import type { IssueWords } from '#shared/utils/field-messages'
import { LANGUAGE_TAGS, isLanguage } from '#shared/utils/languages'

// A field stored in US units (endTempF, grossBeforeLb, waterAddedGal, lengthIn) is typed in the site's units:
// its limits are not said as numbers, which would be in the stored unit.
const STORED_UNIT_FIELD = /(F|Lb|Gal|In)$/

/**
 * Zod issues in the reader's words (field_issue.* in i18n/locales), from the issue's code and limits, each
 * number written as the reader's language writes it on a US floor (es-US: 100,000); English keeps the schema's
 * own messages. A check with its own rule (custom) keeps the schema's words.
 */
export function issueWordsFor(t: (key: string, params?: Record<string, unknown>) => string, locale: string): IssueWords | undefined {
  if (locale === 'en') return undefined
  const numbers = new Intl.NumberFormat(LANGUAGE_TAGS[isLanguage(locale) ? locale : 'en'], { maximumFractionDigits: 6 })
  const n = (value: unknown) => ({ n: numbers.format(Number(value)) })
  return (issue: z.core.$ZodIssue) => {
    const field = String(issue.path.at(-1) ?? '')
    const limits = !STORED_UNIT_FIELD.test(field)
    // an e-mail address too short or badly written, or a field that only has to be filled, says so plainly
    if (field === 'email' && (issue.code === 'too_small' || issue.code === 'invalid_format')) return t('field_issue.email')
    if (issue.code === 'too_small' && issue.origin === 'string' && Number(issue.minimum) <= 1) return t('field_issue.required')
    switch (issue.code) {
      case 'invalid_type': return issue.expected === 'number' ? t('field_issue.number') : t('field_issue.required')
      case 'too_small':
        if (issue.origin === 'string') return t('field_issue.short', n(issue.minimum))
        if (issue.origin === 'array') return t('field_issue.required')
        return limits ? t('field_issue.min', n(issue.minimum)) : t('field_issue.range')
      case 'too_big':
        if (issue.origin === 'string') return t('field_issue.long', n(issue.maximum))
        return limits ? t('field_issue.max', n(issue.maximum)) : t('field_issue.range')
      case 'invalid_value': return t('field_issue.choose')
      // a day written right that is not on the calendar (30 February) says so
      case 'invalid_format': return issue.format === 'date' ? t('field_issue.date') : t('field_issue.format')
      // a field the record does not have
      case 'unrecognized_keys': return t('field_issue.unknown')
      default: return undefined
    }
  }
}
