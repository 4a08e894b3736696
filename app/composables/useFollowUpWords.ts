import { followUpTitle } from '#shared/utils/follow-up-words'

export type { FollowUpTitleWords } from '#shared/utils/follow-up-words'

// A follow-up's title in the reader's words (shared/utils/follow-up-words.ts; the daily digest says it the same way).
export function useFollowUpWords() {
  const { t, te } = useNuxtApp().$i18n
  const { day } = useLocaleFormat()
  return {
    title: (f: Parameters<typeof followUpTitle>[0]): string => followUpTitle(f, { t, has: te, day }),
  }
}
