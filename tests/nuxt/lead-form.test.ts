import { describe, expect, it } from 'vitest'
import { scheduleCreateSchema } from '../../shared/utils/schedule-schemas'
import { siteUpdateSchema } from '../../shared/utils/admin-schemas'
import { siteSettingsSchema } from '../../shared/utils/site-settings'
import { useLeadForm } from '../../app/composables/useLeadForm'
import { fieldError } from '../../app/utils/errors'

// A lead's form: the shared schema before sending (worded by the form's hints), one send, and the
// server's refusal at the fields and in words.
const body = { siteId: '7b0c6a3e-5a0b-4c41-9a57-1d1f0f4b2c11', title: 'Extinguisher yearly maintenance', subjectKind: 'area', every: 1, unit: 'year', dueSoonDays: 14, responsibleRole: 'safety_lead', source: '' }

describe('useLeadForm', () => {
  it('runs the schema first: field messages (hints where given), nothing sent', async () => {
    let sent = 0
    const form = useLeadForm({ every: 'A whole number from 1 to 1000.' })
    expect(await form.submit(scheduleCreateSchema, { ...body, title: 'x', every: 0 }, async () => sent++)).toBeUndefined()
    expect(sent).toBe(0)
    expect(form.fields.value.every).toBe('A whole number from 1 to 1000.')
    expect(form.fields.value.title).toBeTruthy()
    expect(form.problem.value).toBe('Check the highlighted fields.')
  })

  it('sends the parsed body once and clears the messages', async () => {
    const form = useLeadForm()
    form.refuse({ every: 'Required.' })
    const sent: unknown[] = []
    expect(await form.submit(scheduleCreateSchema, body, async data => (sent.push(data), 'ok'))).toBe('ok')
    expect(sent).toHaveLength(1)
    expect(form.fields.value).toEqual({})
    expect(form.problem.value).toBe('')
    expect(form.saving.value).toBe(false)
  })

  it('a refusal from the server lands at its fields and in words', async () => {
    const form = useLeadForm()
    const refusal = { statusCode: 400, data: { message: 'A schedule with that name exists.', data: { fields: { title: 'Pick another name.' } } } }
    expect(await form.submit(scheduleCreateSchema, body, async () => Promise.reject(refusal))).toBeUndefined()
    expect(form.fields.value).toEqual({ title: 'Pick another name.' })
    expect(form.problem.value).toContain('A schedule with that name exists.')
  })

  it('a 400 from the server reads in Spanish at each field the server sent an issue for; a rule of its own keeps its words', async () => {
    const { $i18n } = useNuxtApp()
    const form = useLeadForm()
    const refusal = { statusCode: 400, data: { message: 'Check the form: every — At most 100,000.', data: {
      code: 'check_fields',
      fields: { every: 'At most 100,000.', unit: 'Only batteries count charges.' },
      issues: { every: { code: 'too_big', origin: 'number', maximum: 100_000 }, unit: { code: 'custom' } },
    } } }
    try {
      await $i18n.setLocale('es')
      expect(await form.submit(scheduleCreateSchema, body, async () => Promise.reject(refusal))).toBeUndefined()
      // field_issue.max in i18n/locales/es.json, the number as es-US groups it (Intl, CLDR: 100,000)
      expect(form.fields.value).toEqual({ every: 'No más de 100,000.', unit: 'Only batteries count charges.' })
    }
    finally {
      await $i18n.setLocale('en')
    }
  })

  it('keys its own check and the server\'s refusal by the same dotted path, so a nested setting lands at one field, in Spanish', async () => {
    const { $i18n } = useNuxtApp()
    // the site form's body with its settings checked as the server checks them (shared/utils/site-settings.ts:
    // cool-down at most 24 × 60 = 1440 minutes, a reorder point at most 1000)
    const schema = siteUpdateSchema.extend({ settings: siteSettingsSchema })
    const settings = { coolDownMinutes: 5000, fullCylinderReorderAt: 2000 }
    // what PATCH /api/sites/:id answers for the same settings (tests/e2e/validation.test.ts)
    const refusal = { statusCode: 400, data: { message: 'Check the site settings.', data: {
      code: 'check_fields',
      fields: { 'settings.coolDownMinutes': 'Too big: expected number to be <=1440', 'settings.fullCylinderReorderAt': 'Too big: expected number to be <=1000' },
      issues: { 'settings.coolDownMinutes': { code: 'too_big', origin: 'number', maximum: 1440 }, 'settings.fullCylinderReorderAt': { code: 'too_big', origin: 'number', maximum: 1000 } },
    } } }
    const form = useLeadForm()
    try {
      await $i18n.setLocale('es')
      expect(await form.submit(schema, { name: 'Dock', settings }, async () => 'sent')).toBeUndefined()
      const own = form.fields.value
      // es-US groups thousands with a comma (Intl, CLDR); below a thousand no separator
      expect(own).toEqual({ 'settings.coolDownMinutes': 'No más de 1,440.', 'settings.fullCylinderReorderAt': 'No más de 1,000.' })
      expect(await form.submit(siteUpdateSchema, { name: 'Dock', settings }, async () => Promise.reject(refusal))).toBeUndefined()
      expect(form.fields.value).toEqual(own)
      expect(form.problem.value).toBe('Revise los campos marcados.')
      expect(fieldError(form.fields.value, 'settings.coolDownMinutes')).toBe('No más de 1,440.')
      // a list's refused item shows at the list's field
      expect(fieldError({ 'settings.shiftStarts.1': 'Revise cómo está escrito.' }, 'settings.shiftStarts')).toBe('Revise cómo está escrito.')
    }
    finally {
      await $i18n.setLocale('en')
    }
  })
})
