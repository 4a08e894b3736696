// A failed request as the reader should see it. With no answer at all: "no connection". With an answer
// in a language other than English that carries a code: the code's words (useReasonWords). Otherwise the
// server's words, else `fallback`, else "something went wrong", in the reader's language where the app's
// words are at hand (outside a component, e.g. in a store, they may not be: then English).
export function errorMessage(error: unknown, fallback?: string): string {
  const app = tryUseNuxtApp()
  const i18n = app?.$i18n
  const say = (key: string, english: string) => (i18n ? i18n.t(key) : english)
  const e = error as { data?: { message?: string }, statusMessage?: string, message?: string, statusCode?: number }
  if (e?.statusCode === undefined && e?.message?.includes('fetch')) return say('app.no_connection', 'No connection to Bayward. Check the network and try again.')
  const coded = codedRefusalText(parseRefusal(error))
  if (coded !== undefined) return coded
  return e?.data?.message || e?.statusMessage || fallback || say('app.something_wrong', 'Something went wrong. Try again.')
}

// A coded refusal (a reason's code, or `data.code`) in the reader's words when the language is not English;
// undefined otherwise, or outside the app (the reason words need the app's stores).
function codedRefusalText(r: Refusal | null): string | undefined {
  const app = tryUseNuxtApp()
  if (!r || !app?.$i18n || app.$i18n.locale.value === 'en' || !(r.reasons[0]?.code || typeof r.data.code === 'string')) return undefined
  try {
    // In a component's setup or render the composables find the app themselves. Elsewhere (an event
    // handler after an await) they run in the app's context; on the server that call answers with a
    // promise, which a page rendered there showed as "[object Promise]".
    const text = getCurrentInstance() ? useReasonWords().refusalText(r) : app.runWithContext(() => useReasonWords().refusalText(r))
    return typeof text === 'string' ? text : undefined
  }
  catch {
    return undefined
  }
}

// Field messages of a 400 answer, keyed by field name (read by the one refusal parser, refusal.ts).
export function errorFields(error: unknown): Record<string, string> {
  return refusalFields(parseRefusal(error))
}

// A refusal's field messages in the reader's language, keyed as the server keys them (fieldKey): each issue the
// server sent with its code and limits in the words the client uses for the same issue before sending
// (issueWordsFor); a coded refusal (data.code other than check_fields) says its code's words at each field it
// names; the server's words otherwise.
export function refusalFields(refusal: Refusal | null): Record<string, string> {
  if (!refusal) return {}
  const coded = refusal.data.code === 'check_fields' ? undefined : codedRefusalText(refusal)
  if (coded !== undefined) {
    // a field with its own problem (data.fieldCodes) is said from that code, the others from the refusal's
    const own = (k: string) => {
      const c = refusal.fieldCodes[k]
      return c ? codedRefusalText({ ...refusal, reasons: [], data: { ...refusal.data, code: c.code, params: c.params } }) : undefined
    }
    return Object.fromEntries(Object.keys(refusal.fields).map(k => [k, own(k) ?? coded]))
  }
  const i18n = tryUseNuxtApp()?.$i18n
  return sentFieldMessages(refusal.fields, refusal.issues, i18n && issueWordsFor(i18n.t, i18n.locale.value))
}

// The message at a field (keyed by fieldKey), or at anything inside it: a list's first refused item
// ('settings.shiftStarts.1') shows at the list's field.
export function fieldError(fields: Record<string, string>, key: string): string | undefined {
  return fields[key] ?? Object.entries(fields).find(([k]) => k.startsWith(`${key}.`))?.[1]
}
