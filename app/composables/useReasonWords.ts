import type { ReasonParams } from '#shared/utils/battery-fit'

const ISO_DAY = /^\d{4}-\d{2}-\d{2}$/

/** A reason as the server sends it: a code with its numbers and names, and English words as the fallback. */
export interface CodedReason { code?: string | null, message: string, params?: ReasonParams }

// The server's reasons in the reader's language: `refusal.<code>_<variant>` or `refusal.<code>` with the
// numbers formatted for the language, values in stored units shown in the site's units, chemistry codes
// pre-fill inspection items and other closed codes (`reason_word.<param>.<code>`) named; the server's English words when this language has no words for the code.
export function useReasonWords() {
  const { t, te, locale } = useNuxtApp().$i18n
  const { number, day } = useLocaleFormat()
  const { units } = storeToRefs(useSessionStore())
  const { holdReason } = useInspectionWords()
  const chemistry = (code: string) => (te(`chemistry.${code}`) ? t(`chemistry.${code}`) : code)
  const listItem = (name: string) => (name === 'items' ? (key: string) => (te(`refill.item.${key}`) ? t(`refill.item.${key}`) : key) : name === 'roles' ? (key: string) => t(`role.${key}`) : chemistry)

  function named(params: ReasonParams = {}): Record<string, string> {
    const out: Record<string, string> = {}
    for (const [name, value] of Object.entries(params)) {
      const stored = typeof value === 'number' ? storedUnitParam(name, value, units.value) : null
      if (stored) out[stored[0]] = stored[1]
      else if (Array.isArray(value)) out[name] = value.length ? value.map(listItem(name)).join(name === 'items' ? '; ' : ', ') : t('chemistry.none')
      else if (typeof value === 'number') out[name] = number(value)
      // a calendar day ('2026-12-03') as the reader's language writes dates
      else if (ISO_DAY.test(value)) out[name] = day(value)
      else if (name === 'reason') out[name] = holdReason(value)
      else out[name] = name === 'chemistry' ? chemistry(value) : te(`reason_word.${name}.${value}`) ? t(`reason_word.${name}.${value}`) : value
    }
    return out
  }

  function reasonText(reason: CodedReason): string {
    if (!reason.code) return reason.message
    const variant = typeof reason.params?.variant === 'string' ? `refusal.${reason.code}_${reason.params.variant}` : null
    const key = variant && te(variant) ? variant : `refusal.${reason.code}`
    return te(key) ? t(key, named(reason.params)) : reason.message
  }

  /** Any coded message (`history.<code>` …) with its parameters named as above; `fallback` when the key is unknown. */
  function codedText(key: string, params: ReasonParams | undefined, fallback: string): string {
    if (!te(key)) return fallback
    return typeof params?.n === 'number' ? t(key, named(params), params.n) : t(key, named(params))
  }

  /** A refusal's first coded reason, else its coded message (`data.code`), else the server's words. */
  function refusalText(r: Refusal): string {
    if (r.reasons[0]?.code) return reasonText(r.reasons[0])
    return typeof r.data.code === 'string' ? reasonText({ code: r.data.code, message: r.message, params: r.data.params as ReasonParams | undefined }) : r.message
  }

  /** A failed request in the reader's words (errorMessage() renders a coded answer in the reader's language). */
  const errorText = (error: unknown, fallback: string): string => errorMessage(error, fallback)

  return { reasonText, refusalText, codedText, errorText, locale }
}
