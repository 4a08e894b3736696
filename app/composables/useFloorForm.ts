import type { Ref } from 'vue'
import type { ZodType } from 'zod'
import type { OutboxRecordInput } from '~/stores/outbox'
import type { CodedReason } from './useReasonWords'

/** A record the server stored ('saved', with its answer) or one kept on this device to send later ('kept'). */
export type FloorOutcome<T> = { state: 'saved', data: T, key: string } | { state: 'kept', key: string }
/** What a floor form says about its record when the outbox keeps it: the label and the entered values in words. */
export interface FloorRecordWords { label: string, details?: string[] }
/** Where a floor form is: being filled in, sending, stored, kept on this device, or refused by the server. */
export type FloorFormState = 'editing' | 'busy' | 'saved' | 'kept' | 'refused'
/** What a code field offers the form: focus, and fill-and-look-up (pre-fill from the URL). */
export interface FloorCodeFieldHandle { focus: () => void, fill: (code: string) => Promise<void> }

type Keyed<B> = B & { idempotencyKey: string }
/** The button of a floor form. */
export interface FloorSubmitButton { label: string, tone?: 'primary' | 'danger', disabled?: boolean, refusedTitle?: string }
/** The done card of a floor form: its title, tone, the server's warnings, "another" and a way on. */
export interface FloorFinish { title: string, tone?: 'safe' | 'warning' | 'danger', warnings?: readonly { message: string }[], again?: string, link?: { to: string, label: string } }
/** What the FloorForm frame reads of a form. */
export interface FloorFormHandle { busy: Ref<boolean>, problem: Ref<string>, refusal: Ref<Refusal | null>, done: Ref<FloorOutcome<unknown> | null> }
export type FloorFormOptions<B, A> = {
  schema?: ZodType | (() => ZodType)
  /** code fields filled from the URL on mount (?truck=…), in order; the first is focused when none was */
  prefill?: () => [name: string, field: Ref<FloorCodeFieldHandle | undefined>][]
} & (
  /** through the device outbox: the body gets the form's idempotency key; kept when the connection drops */
  | { send: (body: Keyed<B>, words: FloorRecordWords) => Promise<FloorOutcome<A>> }
  /** straight to the server (routes that store no retry key): saved or refused, never kept */
  | { sendNow: (body: B) => Promise<A> }
)

/** Records from the device outbox: the kept record with its key, or the server's answer. */
export function useFloorSubmit() {
  const outbox = useOutboxStore()
  return { submitFloorRecord: <T>(input: OutboxRecordInput) => outbox.submit<T>(input) }
}

// One floor form's life: the shared zod schema checked before sending (field messages at the field), the
// idempotency key, busy / saved / kept / refused, the done card's outcome, "another", pre-fill from the URL.
export function useFloorForm<B extends object, A = unknown>(options: FloorFormOptions<B, A>) {
  const route = useRoute()
  // the kit's own words (floor.* in i18n/locales), from the app's one i18n (callable outside a component too)
  const { t, locale } = useNuxtApp().$i18n
  const { reasonText } = useReasonWords()
  const key = ref(newIdempotencyKey())
  const busy = ref(false)
  const fields = ref<Record<string, string>>({})
  const problem = ref('')
  const refusal = ref<Refusal | null>(null)
  const done = ref(null) as Ref<FloorOutcome<A> | null>
  const state = computed<FloorFormState>(() => (busy.value ? 'busy' : done.value ? done.value.state : refusal.value ? 'refused' : 'editing'))

  function clear() {
    fields.value = {}
    problem.value = ''
    refusal.value = null
  }

  /** Runs the shared schema; false (with the field messages set) when the body would be refused. */
  function validate(body: object): boolean {
    const schema = typeof options.schema === 'function' ? options.schema() : options.schema
    if (!schema) return true
    const result = schema.safeParse(body)
    if (result.success) return true
    fields.value = fieldMessages(result.error, issueWordsFor(t, locale.value))
    problem.value = fields.value._ ?? t('floor.check_fields')
    return false
  }

  /** Checks and sends the record; resolves its outcome, or null when it was not stored (messages set). */
  async function submit(body: B, words: FloorRecordWords = { label: '' }): Promise<FloorOutcome<A> | null> {
    clear()
    const keyed = 'send' in options ? { ...body, idempotencyKey: key.value } : body
    if (!validate(keyed)) return null
    busy.value = true
    try {
      done.value = 'send' in options
        ? await options.send(keyed as Keyed<B>, words)
        : { state: 'saved', data: await options.sendNow(body), key: key.value }
      key.value = newIdempotencyKey()
      return done.value
    }
    catch (error) {
      const r = parseRefusal(error)
      if (!r) problem.value = t('floor.no_connection')
      else if (r.reasons.length) refusal.value = r
      else {
        // a coded 400/409 (data.code, data.params) in the reader's words, at each field it names
        // (check_fields: each field's issue in the reader's words from its code and limits, the summary too)
        const coded = typeof r.data.code === 'string' && locale.value !== 'en'
          ? reasonText({ code: r.data.code, message: r.message, params: r.data.params as CodedReason['params'] })
          : null
        fields.value = refusalFields(r)
        problem.value = coded && Object.keys(r.fields).length ? t('floor.check_fields') : coded ?? r.message
      }
      return null
    }
    finally {
      busy.value = false
    }
  }

  /** Back to an empty form for the next record ("another"). */
  function again() {
    clear()
    done.value = null
  }

  /** A pre-fill value from the URL (?battery=B-00012), or ''. */
  const query = (name: string): string => (typeof route.query[name] === 'string' ? route.query[name] as string : '')

  /** Fills and looks up each code field named in the URL, in order; true when any was. */
  async function prefill(pairs: [name: string, field: Ref<FloorCodeFieldHandle | undefined>][]): Promise<boolean> {
    let any = false
    for (const [name, field] of pairs) {
      const value = query(name)
      if (!value) continue
      any = true
      await nextTick()
      await field.value?.fill(value)
    }
    return any
  }

  if (options.prefill) {
    onMounted(async () => {
      const pairs = options.prefill!()
      // nothing in the URL: the first field takes the keyboard at once (a scanner may already be typing)
      if (!pairs.some(([name]) => query(name))) return pairs[0]?.[1].value?.focus()
      await prefill(pairs)
    })
  }

  return { key, busy, fields, problem, refusal, done, state, validate, submit, again, clear, query, prefill }
}
