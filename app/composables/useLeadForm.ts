import type { z } from 'zod'

// A lead's form (schedules, settings, assets): the shared zod schema runs first and its issues become
// field messages keyed by dotted path (fieldKey; `hints`, by the same keys, word them in the form's own terms), then one send at a time; a refusal from the
// server comes back in words and per field. The floor forms have their own kit (useFloorForm), with an
// outbox; a lead's form is sent at once or not at all.
export function useLeadForm(hints: Record<string, string> = {}) {
  const fields = ref<Record<string, string>>({})
  const problem = ref('')
  const saving = ref(false)
  const { t, locale } = useNuxtApp().$i18n
  const { errorText } = useReasonWords()

  /** A check the schema cannot make (a field this form requires that the route leaves optional). */
  function refuse(messages: Record<string, string>) {
    fields.value = messages
    problem.value = t('lead_form.check_fields')
  }

  async function submit<S extends z.ZodType, R>(schema: S, body: unknown, send: (data: z.output<S>) => Promise<R>): Promise<R | undefined> {
    problem.value = ''
    const parsed = schema.safeParse(body)
    if (!parsed.success) {
      // keyed as the server keys its refusal (fieldKey), so both land at the same field
      const messages = fieldMessages(parsed.error, issueWordsFor(t, locale.value))
      fields.value = Object.fromEntries(Object.entries(messages).map(([key, message]) => [key, hints[key] ?? message]))
      problem.value = t('lead_form.check_fields')
      return undefined
    }
    saving.value = true
    try {
      const result = await send(parsed.data)
      fields.value = {}
      return result
    }
    catch (error) {
      fields.value = errorFields(error)
      problem.value = errorText(error, errorMessage(error))
      return undefined
    }
    finally {
      saving.value = false
    }
  }

  return { fields, problem, saving, submit, refuse }
}
