import { LANGUAGE_TAGS, isLanguage } from '#shared/utils/languages'
import { keptDateFormat, keptNumberFormat } from '#shared/utils/intl-formats'
import { localDate } from '#shared/utils/due-dates'

// Numbers, money and dates as the reader's language writes them on a US floor (en-US, es-US). Intl with the
// regional tag: the bare 'es' would write 1850 without its comma and a 24-hour clock.
// The formatters are made once per tag and options and kept (shared/utils/intl-formats.ts).

// Moments (a time, a date and time) read on the clock of the site being worked on, so a lead away from it, and the
// server drawing the page first, say the same "shift began 2:00 PM" as the floor; a calendar day (`day`) has no zone.

export function useLocaleFormat() {
  const { locale } = useNuxtApp().$i18n
  const tag = () => LANGUAGE_TAGS[isLanguage(locale.value) ? locale.value : 'en']
  const session = useSessionStore()
  const zone = (): { timeZone?: string } => (session.currentSite?.timeZone ? { timeZone: session.currentSite.timeZone } : {})
  return {
    /** the BCP 47 tag of the reader's language (en-US, es-US) */
    tag,
    /** a number with at most `maximumFractionDigits` decimals; a column of readings passes `minimumFractionDigits` too (0.50, 0.39) */
    number: (value: number, maximumFractionDigits = 2, minimumFractionDigits = 0) => keptNumberFormat(tag(), { maximumFractionDigits, minimumFractionDigits }).format(value),
    money: (value: number, currency: string) => keptNumberFormat(tag(), { style: 'currency', currency }).format(value),
    dateTime: (at: string | Date) => keptDateFormat(tag(), { dateStyle: 'medium', timeStyle: 'short', ...zone() }).format(new Date(at)),
    /** the clock time alone (3:05 PM / 3:05 p.m.) */
    time: (at: string | Date) => keptDateFormat(tag(), { hour: 'numeric', minute: '2-digit', ...zone() }).format(new Date(at)),
    /** the date alone, medium (Dec 3, 2026 / 3 dic 2026) */
    date: (at: string | Date) => keptDateFormat(tag(), { dateStyle: 'medium', ...zone() }).format(new Date(at)),
    /** a calendar day ('2026-12-03') as `date` writes it, read at its noon so no time zone moves it to the day before */
    day: (isoDay: string) => keptDateFormat(tag(), { dateStyle: 'medium' }).format(new Date(`${isoDay}T12:00:00`)),
    /** today's calendar day at the site being worked on ('2026-12-04'), the device's own day without a site; not UTC's,
     * which is already tomorrow on a US evening shift */
    today: (at = new Date()) => localDate(at, session.currentSite?.timeZone ?? Intl.DateTimeFormat().resolvedOptions().timeZone),
  }
}
