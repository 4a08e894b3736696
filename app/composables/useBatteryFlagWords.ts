// A status flag (wateringOverdue, weakCell, inspection_last …) in the reader's words: bay.flag.<snake_case
// key>, a time parameter shown as a local date and time, a calendar day (YYYY-MM-DD) as a date; the server's
// English label when the key is unknown.
export function useBatteryFlagWords() {
  const { t, te } = useNuxtApp().$i18n
  const { dateTime, day } = useLocaleFormat()
  const key = (flag: string) => `bay.flag.${flag.replace(/[A-Z]/g, c => `_${c.toLowerCase()}`)}`
  const shown = (value: string | number) => {
    if (typeof value !== 'string') return value
    if (/^\d{4}-\d{2}-\d{2}$/.test(value)) return day(value)
    return /^\d{4}-\d{2}-\d{2}T/.test(value) ? dateTime(value) : value
  }
  return (flag: string, label: string, params?: Record<string, string | number>) => {
    if (!te(key(flag))) return label
    return params ? t(key(flag), Object.fromEntries(Object.entries(params).map(([k, v]) => [k, shown(v)]))) : t(key(flag))
  }
}
