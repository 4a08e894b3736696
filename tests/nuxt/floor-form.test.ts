import { describe, expect, it } from 'vitest'
import { chargeEndSchema, swapBodySchema } from '../../shared/utils/battery-room-schemas'
import { parseRefusal } from '../../app/utils/refusal'
import { errorFields, errorMessage } from '../../app/utils/errors'
import { fieldIssues, fieldMessages } from '../../shared/utils/field-messages'
import { isoDateSchema } from '../../shared/utils/iso-date'
import { issueWordsFor } from '../../app/utils/issue-words'
import { newIdempotencyKey } from '../../app/utils/idempotency'
import { useFloorForm } from '../../app/composables/useFloorForm'
import { useReasonWords } from '../../app/composables/useReasonWords'
import { useBatteryFlagWords } from '../../app/composables/useBatteryFlagWords'
import { useDueWords } from '../../app/composables/useDueWords'
import { useSessionStore } from '../../app/stores/session'
import { overfillReason, prefillFailedReason, tareLossReason } from '../../shared/utils/fuel-reasons'
import { truckAuthorisationReason } from '../../shared/utils/truck-authorisation'

// The floor-form kit: one refusal parser for every shape the routes answer, the shared schema before
// sending, and the states a form goes through.
const fetchError = (status: number, data: Record<string, unknown>) => ({ statusCode: status, data })

describe('parseRefusal', () => {
  it('reads reasons as strings or { code, message }, field messages and the message', () => {
    expect(parseRefusal(fetchError(409, { message: 'Not allowed yet.', data: { reasons: ['Past its requalification date.'], offerQuarantine: true } }))).toMatchObject({
      status: 409, message: 'Not allowed yet.', reasons: [{ code: null, message: 'Past its requalification date.' }], offerQuarantine: true, overridable: false,
    })
    expect(parseRefusal(fetchError(409, { message: '', data: { reasons: [{ code: 'not_cooled', message: 'Still cooling.' }], overridable: true } }))).toMatchObject({
      message: 'Still cooling.', reasons: [{ code: 'not_cooled', message: 'Still cooling.' }], overridable: true,
    })
    expect(parseRefusal(fetchError(400, { message: 'Check the form.', data: { fields: { hourMeter: 'Not below 0.' } } }))).toMatchObject({
      reasons: [], fields: { hourMeter: 'Not below 0.' }, message: 'Check the form.',
    })
    expect(parseRefusal(fetchError(403, {}))?.message).toBe('Bayward refused it (403).')
  })

  it('keeps a reason\'s code and params, and says it in the reader\'s language, the English words when it has none', async () => {
    const refusal = parseRefusal(fetchError(409, { message: 'x', data: { reasons: [
      { code: 'under_minimum_weight', message: 'Battery weighs 1,850 lb; minimum is 2,100 lb.', params: { battery_lb: 1850, truck_lb: 2100 } },
      { code: 'charger_profile_missing', message: 'Charger has no lithium-ion profile.', params: { chemistry: 'lithium_ion', chemistries: ['flooded_lead_acid', 'agm'] } },
      { code: 'not_charged', message: 'Battery is still on charge.', params: { variant: 'on_charge' } },
      { code: 'a_code_with_no_words', message: 'Words from the server.' },
    ] } }))!
    expect(refusal.reasons[0]).toEqual({ code: 'under_minimum_weight', message: 'Battery weighs 1,850 lb; minimum is 2,100 lb.', params: { battery_lb: 1850, truck_lb: 2100 } })
    const { reasonText } = useReasonWords()
    const { $i18n } = useNuxtApp()
    try {
      await $i18n.setLocale('es')
      expect(refusal.reasons.map(reasonText)).toEqual([
        'La batería pesa 1,850 lb; el mínimo de la placa es 2,100 lb. Una batería liviana afecta el contrapeso.',
        'El cargador no tiene perfil para litio-ion (tiene: plomo-ácido inundada, AGM).',
        'La batería sigue cargando; deje que termine la carga.',
        'Words from the server.',
      ])
      // a refill correction that fails the fill's checks says which check, by its variant
      const { refusalText } = useReasonWords()
      const failsFill = (variant: string) => refusalText(parseRefusal(fetchError(409, { message: 'These figures fail the fill\'s checks (overfilled).', data: { code: 'correction_fails_fill', params: { variant } } }))!)
      expect(failsFill('overfilled')).toMatch(/^Estos datos no pasan las revisiones del llenado: el cilindro quedaría sobrellenado\./)
      expect(failsFill('tare_loss')).toMatch(/: el peso tara medido bajó lo bastante para pedir recalificación\./)
      await $i18n.setLocale('en')
      expect(reasonText(refusal.reasons[2]!)).toBe('Battery is still on charge; let the charge finish.')
    }
    finally {
      await $i18n.setLocale('en')
    }
  })

  it('says a failed request in the reader\'s language: no connection, a coded answer, and the plain fallback', async () => {
    const { $i18n } = useNuxtApp()
    const offline = new TypeError('fetch failed')
    const coded = fetchError(404, { message: 'No such truck.', data: { code: 'no_such_truck' } })
    const uncoded = fetchError(500, {})
    try {
      expect([errorMessage(offline), errorMessage(coded), errorMessage(uncoded)]).toEqual([
        'No connection to Bayward. Check the network and try again.', 'No such truck.', 'Something went wrong. Try again.',
      ])
      await $i18n.setLocale('es')
      expect([errorMessage(offline), errorMessage(coded), errorMessage(uncoded), errorMessage(uncoded, 'No se pudo cargar.')]).toEqual([
        'Sin conexión con Bayward. Revise la red e intente de nuevo.', 'No existe ese montacargas.', 'Algo salió mal. Intente de nuevo.', 'No se pudo cargar.',
      ])
      // a status flag with a time: the reader's words and the time as the device's clock reads it
      const flag = useBatteryFlagWords()
      expect(flag('inspection_last', 'Last pre-shift check 2026-12-03 12:00 UTC', { at: '2026-12-03T12:00:00.000Z' })).toMatch(/^Última inspección antes del turno: .*2026/)
      expect(flag('a_flag_with_no_words', 'Server words')).toBe('Server words')
      // a due item's detail sent as a code
      const due = useDueWords()
      expect(due.detail({ detail: '6 of 8 charges since watering', detailWords: { code: 'charges_since_watering', params: { now: 6, every: 8 } } })).toBe('6 de 8 cargas desde que se repuso agua')
      expect(due.detail({ detail: '2 failed item(s)', detailWords: { code: 'failed_items', params: { n: 2 } } })).toBe('2 puntos fallaron')
      expect(due.detail({ detail: 'Ines Ward', detailWords: null })).toBe('Ines Ward')
      // a calendar day stays that day in any time zone
      expect(flag('emissions_failed', 'Emissions test failed on 2026-03-10: retest by 2026-04-09', { on: '2026-03-10', by: '2026-04-09' }))
        .toBe('Prueba de emisiones reprobada el 10 mar 2026: repetir antes del 9 abr 2026')
    }
    finally {
      await $i18n.setLocale('en')
    }
  })

  it('shows a value sent in stored pounds or inches in the site\'s units: kg and mm on a metric site, in Spanish', async () => {
    const session = useSessionStore()
    const { reasonText } = useReasonWords()
    const { $i18n } = useNuxtApp()
    const reasons = [
      overfillReason(1.6, 38.5, 80.2, 48),
      tareLossReason(28.5, 30, 5),
      prefillFailedReason(['dents', 'relief_valve'], ['No dents', 'Relief valve in good order']),
      { code: 'too_long_for_compartment', message: 'Battery is 39 in long; the compartment takes 38.5 in.', params: { battery_in: 39, compartment_in: 38.5 } },
    ]
    try {
      session.me = { user: { id: 'u', email: 'ana@example.test', name: 'Ana' }, memberships: [], sites: [{ id: 's', name: 'Dock', timeZone: 'America/Chicago', unitSystem: 'metric' }] }
      await $i18n.setLocale('es')
      // 1.6 lb = 0.7257… kg, 38.5 lb = 17.46… kg, 80.2 lb = 36.38… kg, 28.5 lb = 12.93 kg, 30 lb = 13.6 kg (1 lb = 0.45359237 kg);
      // 39 in = 990.6 mm, 38.5 in = 977.9 mm (1 in = 25.4 mm)
      expect(reasons.map(reasonText)).toEqual([
        'Sobrellenado por 0.73 kg: el límite es 17.5 kg (capacidad de agua 36.4 kg × 48 %). Saque el exceso antes de que el cilindro salga de la estación y vuelva a pesarlo.',
        'El peso tara medido, 12.9 kg, está 5 % abajo del marcado 13.6 kg (5 % o más): mande el cilindro a recalificación antes de llenarlo.',
        'No pasó la inspección antes del llenado: Sin abolladuras; Válvula de alivio en buen estado. No llene este cilindro.',
        'La batería mide 991 mm de largo; el compartimento acepta 978 mm.',
      ])
      session.me = { ...session.me, sites: [{ id: 's', name: 'Dock', timeZone: 'America/Chicago', unitSystem: 'us' }] }
      await $i18n.setLocale('en')
      expect(reasonText(reasons[0]!)).toBe('Overfilled by 1.6 lb: the limit is 38.5 lb (water capacity 80.2 lb × 48 %). Remove the excess before the cylinder leaves the station, then weigh it again.')
    }
    finally {
      session.me = null
      await $i18n.setLocale('en')
    }
  })

  it('says why an operator may not take a truck of a class in the reader\'s words, its days as the language writes dates', async () => {
    const { reasonText } = useReasonWords()
    const { $i18n } = useNuxtApp()
    const q = { trainedOn: '2022-03-01', evaluatedOn: '2022-03-02', expiresOn: '2025-03-02' }
    const lapsed = truckAuthorisationReason(1, q, null, '2026-12-03')!
    const called = truckAuthorisationReason(2, { ...q, evaluatedOn: '2026-01-10', expiresOn: '2029-01-10' }, { happenedOn: '2026-02-01', reason: 'near_miss' }, '2026-12-03')!
    try {
      await $i18n.setLocale('es')
      // dates as es-US writes them (Intl.DateTimeFormat, dateStyle medium)
      expect(reasonText(lapsed)).toBe('Su evaluación en montacargas clase 1 venció el 2 mar 2025 (evaluado el 2 mar 2022; cada tres años, 29 CFR 1910.178(l)(4)(iii)).')
      expect(reasonText(called)).toBe('Se pidió reentrenamiento el 1 feb 2026 (tuvo un casi accidente); primero necesita una nueva evaluación en montacargas clase 2.')
      await $i18n.setLocale('en')
      expect(reasonText(called)).toBe('Retraining was called for on Feb 1, 2026 (involved in a near miss); a new evaluation on class 2 trucks is due first.')
    }
    finally {
      await $i18n.setLocale('en')
    }
  })

  it('says a server 400\'s field messages in the reader\'s words from each field\'s sent issue; a rule of its own keeps the server\'s', async () => {
    // what validateBody answers (server/utils/validation.ts): English at each field, and each field's issue beside it
    const english = {
      'title': 'At least 3 characters.', 'source': 'At most 300 characters.', 'every': 'At least 1.', 'hourMeter': 'Hour meter must be a number.',
      'endTempF': 'Above 200 °F is not a reading.', 'unit': 'Only batteries count charges.', 'cells.3.specificGravity': 'Not above 1.4.',
      'odd': 'Server words.', 'bare': 'Words without a limit.', 'unsent': 'No issue sent.',
    }
    const answer = fetchError(400, { message: 'Check the form: title — At least 3 characters.', data: {
      code: 'check_fields',
      fields: english,
      issues: {
        'title': { code: 'too_small', origin: 'string', minimum: 3 }, 'source': { code: 'too_big', origin: 'string', maximum: 300 },
        'every': { code: 'too_small', origin: 'number', minimum: 1 }, 'hourMeter': { code: 'invalid_type', expected: 'number' },
        'endTempF': { code: 'too_big', origin: 'number', maximum: 200 }, 'unit': { code: 'custom' },
        'cells.3.specificGravity': { code: 'too_big', origin: 'number', maximum: 1.4 },
        'odd': { code: 'a_code_with_no_words' }, 'bare': { code: 'too_big', origin: 'number' }, 'extra': { code: 'too_big', maximum: 1 },
      },
    } })
    // Spanish from field_issue.* in i18n/locales/es.json; a stored-unit field (°F) gets no number; custom, unknown codes,
    // a limit not sent and a field with no issue keep the server's words
    const spanish = {
      ...english, 'title': 'Al menos 3 caracteres.', 'source': 'Máximo 300 caracteres.', 'every': 'No menos de 1.', 'hourMeter': 'Escriba un número.',
      'endTempF': 'Parece incorrecto; revise la lectura.', 'cells.3.specificGravity': 'No más de 1.4.',
    }
    const { $i18n } = useNuxtApp()
    const form = useFloorForm<object, unknown>({ sendNow: async () => Promise.reject(answer) })
    try {
      expect(parseRefusal(answer)?.issues).not.toHaveProperty('extra')
      expect(errorFields(answer)).toEqual(english)
      await form.submit({})
      expect(form.fields.value).toEqual(english)
      await $i18n.setLocale('es')
      expect(errorFields(answer)).toEqual(spanish)
      await form.submit({})
      expect(form.fields.value).toEqual(spanish)
      expect(form.problem.value).toBe('Revise los campos marcados abajo.')
      // what the server sends for a schema's issues reads as the client's own check of the same body would
      const error = chargeEndSchema.safeParse({ ampHoursReturned: -1, endTempF: 500, outcome: 'maybe', packStateOfChargePct: 150 }).error!
      const sent = fetchError(400, { data: { code: 'check_fields', fields: fieldMessages(error), issues: JSON.parse(JSON.stringify(fieldIssues(error))) } })
      expect(errorFields(sent)).toEqual(fieldMessages(error, issueWordsFor($i18n.t, 'es')))
    }
    finally {
      await $i18n.setLocale('en')
    }
  })

  it('says a duplicate e-mail, an oversized file and a role not held in Spanish from their codes and params', async () => {
    // what the server answers (server/api/users/index.post.ts, server/utils/uploads.ts, server/utils/due/due-list.ts)
    const email = fetchError(409, { message: 'That e-mail already has an account.', data: { code: 'email_taken', fields: { email: 'Already has an account.' } } })
    const big = fetchError(413, { message: 'The file is larger than 10 MB.', data: { code: 'file_too_large', params: { mb: 10 } } })
    const role = fetchError(403, { message: 'You do not hold the Technician role here.', data: { code: 'role_not_held', params: { roles: ['technician'] } } })
    const { $i18n } = useNuxtApp()
    try {
      await $i18n.setLocale('es')
      // refusal.* and role.* in i18n/locales/es.json
      expect([errorMessage(email), errorFields(email)]).toEqual(['Ese correo ya tiene una cuenta.', { email: 'Ese correo ya tiene una cuenta.' }])
      expect(errorMessage(big)).toBe('El archivo pesa más de 10 MB.')
      expect(errorMessage(role)).toBe(`Usted no tiene el puesto de ${$i18n.t('role.technician')} aquí.`)
      await $i18n.setLocale('en')
      // English keeps the server's own words, at the field too
      expect([errorMessage(email), errorFields(email)]).toEqual(['That e-mail already has an account.', { email: 'Already has an account.' }])
    }
    finally {
      await $i18n.setLocale('en')
    }
  })

  it('says the upload, registry and database refusals from their codes in Spanish, at their fields and as a whole', async () => {
    // what the server answers (server/utils/uploads.ts, registry.ts updateAsset, pg-errors.ts unstorableValueError)
    const empty = fetchError(400, { message: 'The file is empty.', data: { code: 'file_empty', fields: { file: 'The file is empty.' } } })
    const unknown = fetchError(400, { message: 'Unknown field: colour.', data: { code: 'check_fields', fields: { colour: 'Not a field of this record.' }, issues: { colour: { code: 'unrecognized_keys' } } } })
    const day = fetchError(400, { message: 'Check the highlighted fields.', data: { code: 'check_fields', fields: { inServiceOn: 'Not a real date.' }, issues: { inServiceOn: { code: 'invalid_format', format: 'date' } } } })
    const unstorable = fetchError(400, { message: 'A value cannot be stored.', data: { code: 'value_unstorable' } })
    const { $i18n } = useNuxtApp()
    try {
      await $i18n.setLocale('es')
      // refusal.* and field_issue.* in i18n/locales/es.json
      expect([errorMessage(empty), errorFields(empty)]).toEqual(['El archivo está vacío.', { file: 'El archivo está vacío.' }])
      expect([errorMessage(unknown), errorFields(unknown)]).toEqual(['Revise los campos marcados.', { colour: 'Este dato no va en este registro.' }])
      expect(errorFields(day)).toEqual({ inServiceOn: 'No es una fecha real.' })
      expect([errorMessage(unstorable), errorFields(unstorable)]).toEqual(['Un dato no se puede guardar. Revise los valores.', {}])
      // the client's own check of the same day says the same (shared/utils/iso-date.ts)
      const error = isoDateSchema.safeParse('2024-02-30').error!
      expect(fieldMessages(error, issueWordsFor($i18n.t, 'es'))).toEqual({ _: 'No es una fecha real.' })
      const form = useFloorForm<object, unknown>({ sendNow: async () => Promise.reject(empty) })
      await form.submit({})
      expect(form.fields.value).toEqual({ file: 'El archivo está vacío.' })
      await $i18n.setLocale('en')
      expect([errorMessage(empty), errorFields(unknown), errorFields(day)]).toEqual(['The file is empty.', { colour: 'Not a field of this record.' }, { inServiceOn: 'Not a real date.' }])
    }
    finally {
      await $i18n.setLocale('en')
    }
  })

  it('says each field of a coded refusal from its own problem where the fields differ', async () => {
    // what fillInputError answers (server/utils/fuel/refill.ts) for a weight below the tare before and after the fill
    const fill = fetchError(400, { message: 'Weight before filling is below the tare weight.', data: {
      code: 'fill_gross_below_tare',
      fields: { grossBeforeLb: 'Weight before filling is below the tare weight.', grossAfterLb: 'Weight after filling is below the tare weight.' },
      fieldCodes: { grossBeforeLb: { code: 'fill_gross_below_tare' }, grossAfterLb: { code: 'fill_gross_below_tare', params: { variant: 'after' } } },
    } })
    const { $i18n } = useNuxtApp()
    try {
      await $i18n.setLocale('es')
      expect(errorFields(fill)).toEqual({
        grossBeforeLb: $i18n.t('refusal.fill_gross_below_tare'),
        grossAfterLb: $i18n.t('refusal.fill_gross_below_tare_after'),
      })
      expect(errorFields(fill).grossAfterLb).not.toBe(errorFields(fill).grossBeforeLb)
      await $i18n.setLocale('en')
      expect(errorFields(fill).grossAfterLb).toBe('Weight after filling is below the tare weight.')
    }
    finally {
      await $i18n.setLocale('en')
    }
  })

  it('no answer at all is no refusal', () => {
    expect(parseRefusal(new TypeError('Failed to fetch'))).toBeNull()
    expect(parseRefusal(undefined)).toBeNull()
  })
})

describe('useFloorForm', () => {
  it('makes version-4 UUIDs without crypto.randomUUID', () => {
    const keys = new Set(Array.from({ length: 50 }, newIdempotencyKey))
    expect(keys.size).toBe(50)
    for (const k of keys) expect(k).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/)
  })

  it('says the shared schema\'s issues in Spanish from their codes, never a limit in the stored unit', async () => {
    const { $i18n } = useNuxtApp()
    try {
      await $i18n.setLocale('es')
      const form = useFloorForm({ schema: chargeEndSchema, send: async () => ({ state: 'saved' as const, data: {}, key: 'k' }) })
      expect(await form.submit({ ampHoursReturned: -1, endTempF: 500, outcome: 'maybe', packStateOfChargePct: 150 })).toBeNull()
      expect(form.fields.value).toMatchObject({
        ampHoursReturned: 'No menos de 0.', endTempF: 'Parece incorrecto; revise la lectura.', outcome: 'Elija una opción.', packStateOfChargePct: 'No más de 100.',
      })
      expect((await form.submit({ ampHoursReturned: Number.NaN, endTempF: 90, outcome: 'complete' }), form.fields.value.ampHoursReturned)).toBe('Escriba un número.')
      // a coded refusal from the server (data.code) at the field it names, in Spanish
      const refused = useFloorForm({
        sendNow: async () => {
          throw fetchError(400, { message: 'The requalification date is in the future.', data: { code: 'requal_future_date', fields: { performedOn: 'Not after today.' } } })
        },
      })
      expect(await refused.submit({})).toBeNull()
      expect(refused.fields.value).toEqual({ performedOn: 'La fecha de recalificación es en el futuro.' })
      expect(refused.problem.value).toBe('Revise los campos marcados abajo.')
    }
    finally {
      await $i18n.setLocale('en')
    }
  })

  it('runs the shared schema first: field messages at the field, nothing sent', async () => {
    let sent = 0
    const form = useFloorForm({ schema: swapBodySchema, send: async () => (sent++, { state: 'saved' as const, data: {}, key: 'k' }) })
    expect(await form.submit({ truckId: '', batteryInId: '', hourMeter: Number.NaN })).toBeNull()
    expect(sent).toBe(0)
    expect(form.fields.value).toMatchObject({ truckId: 'Pick the truck.', batteryInId: 'Pick the battery going in.', hourMeter: 'Hour meter must be a number.' })
    expect(form.state.value).toBe('editing')
  })

  it('sends with the form\'s key, then takes a new key for the next record; a kept record is "kept"', async () => {
    const bodies: { idempotencyKey: string }[] = []
    const form = useFloorForm<{ n: number }, unknown>({ send: async body => (bodies.push(body), { state: 'kept' as const, key: body.idempotencyKey }) })
    const first = form.key.value
    await form.submit({ n: 1 })
    expect(bodies[0]!.idempotencyKey).toBe(first)
    expect(form.state.value).toBe('kept')
    expect(form.key.value).not.toBe(first)
    form.again()
    expect(form.state.value).toBe('editing')
  })

  it('a refusal with reasons is "refused"; a 400 puts its field messages at the fields; no answer says nothing was saved', async () => {
    const refused = useFloorForm<object, unknown>({ sendNow: async () => Promise.reject(fetchError(409, { message: 'No.', data: { reasons: ['Charger busy.'] } })) })
    await refused.submit({})
    expect(refused.state.value).toBe('refused')
    expect(refused.refusal.value?.reasons[0]?.message).toBe('Charger busy.')
    const invalid = useFloorForm<object, unknown>({ sendNow: async () => Promise.reject(fetchError(400, { message: 'Check the form.', data: { fields: { testedOn: 'Not after today.' } } })) })
    await invalid.submit({})
    expect(invalid.fields.value).toEqual({ testedOn: 'Not after today.' })
    const offline = useFloorForm<object, unknown>({ sendNow: async () => Promise.reject(new TypeError('Failed to fetch')) })
    await offline.submit({})
    expect(offline.problem.value).toMatch(/nothing was saved/)
  })
})
