// A battery's care flag (wateringOverdue, weakCell …) in the reader's words: bay.flag.<snake_case key>; the
// server's English label when the key is unknown.
export function useBatteryFlagWords() {
  const { t, te } = useNuxtApp().$i18n
  const key = (flag: string) => `bay.flag.${flag.replace(/[A-Z]/g, c => `_${c.toLowerCase()}`)}`
  return (flag: string, label: string) => (te(key(flag)) ? t(key(flag)) : label)
}
