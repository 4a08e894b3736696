// A status flag (wateringOverdue, weakCell, inspection_last …) in the reader's words: bay.flag.<snake_case
// key>, a time parameter (`at`) shown as a local date and time; the server's English label when the key is unknown.
export function useBatteryFlagWords() {
  const { t, te } = useNuxtApp().$i18n
  const { dateTime } = useLocaleFormat()
  const key = (flag: string) => `bay.flag.${flag.replace(/[A-Z]/g, c => `_${c.toLowerCase()}`)}`
  return (flag: string, label: string, params?: Record<string, string | number>) => {
    if (!te(key(flag))) return label
    return params ? t(key(flag), { ...params, ...(typeof params.at === 'string' ? { at: dateTime(params.at) } : {}) }) : t(key(flag))
  }
}
