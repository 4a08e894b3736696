// Intl formatters made once per locale and options and kept: making one costs about a tenth of a
// millisecond, and a report or a board formats dozens of months, days and numbers a request.

const dateFormats = new Map<string, Intl.DateTimeFormat>()
const numberFormats = new Map<string, Intl.NumberFormat>()

/** `new Intl.DateTimeFormat(locale, options)`, made once per locale and options. */
export function keptDateFormat(locale: string, options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  const key = `${locale}|${JSON.stringify(options)}`
  let format = dateFormats.get(key)
  if (!format) dateFormats.set(key, format = new Intl.DateTimeFormat(locale, options))
  return format
}

/** `new Intl.NumberFormat(locale, options)`, made once per locale and options. */
export function keptNumberFormat(locale: string, options: Intl.NumberFormatOptions): Intl.NumberFormat {
  const key = `${locale}|${JSON.stringify(options)}`
  let format = numberFormats.get(key)
  if (!format) numberFormats.set(key, format = new Intl.NumberFormat(locale, options))
  return format
}
