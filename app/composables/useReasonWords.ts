import type { ReasonParams } from '#shared/utils/battery-fit'

/** A reason as the server sends it: a code with its numbers and names, and English words as the fallback. */
export interface CodedReason { code?: string | null, message: string, params?: ReasonParams }

// The server's reasons in the reader's language: `refusal.<code>_<variant>` or `refusal.<code>` with the
// numbers formatted for the language and chemistry codes named; the server's English words when this
// language has no words for the code.
export function useReasonWords() {
  const { t, te, locale } = useNuxtApp().$i18n
  const { number } = useLocaleFormat()
  const chemistry = (code: string) => (te(`chemistry.${code}`) ? t(`chemistry.${code}`) : code)

  function named(params: ReasonParams = {}): Record<string, string> {
    const out: Record<string, string> = {}
    for (const [name, value] of Object.entries(params)) {
      if (Array.isArray(value)) out[name] = value.length ? value.map(chemistry).join(', ') : t('chemistry.none')
      else if (typeof value === 'number') out[name] = number(value)
      else out[name] = name === 'chemistry' ? chemistry(value) : value
    }
    return out
  }

  function reasonText(reason: CodedReason): string {
    if (!reason.code) return reason.message
    const variant = typeof reason.params?.variant === 'string' ? `refusal.${reason.code}_${reason.params.variant}` : null
    const key = variant && te(variant) ? variant : `refusal.${reason.code}`
    return te(key) ? t(key, named(reason.params)) : reason.message
  }

  return { reasonText, locale }
}
