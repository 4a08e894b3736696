import { describe, expect, it } from 'vitest'
import { keptDateFormat, keptNumberFormat } from '../../shared/utils/intl-formats'

// A kept formatter writes what a new Intl formatter of the same locale and options writes (Intl itself is
// the check), and one is made per locale and options.
describe('kept Intl formatters', () => {
  it('write as a fresh formatter does, one per locale and options', () => {
    const march = new Date('2026-03-01T00:00:00Z')
    const options: Intl.DateTimeFormatOptions = { month: 'short', year: 'numeric', timeZone: 'UTC' }
    expect(keptDateFormat('es-US', options).format(march)).toBe(new Intl.DateTimeFormat('es-US', options).format(march))
    expect(keptDateFormat('es-US', { ...options })).toBe(keptDateFormat('es-US', options))
    expect(keptDateFormat('en-US', options)).not.toBe(keptDateFormat('es-US', options))
    expect(keptDateFormat('en-US', { ...options, timeZone: 'America/Chicago' })).not.toBe(keptDateFormat('en-US', options))
    expect(keptNumberFormat('es-US', { maximumFractionDigits: 1 }).format(1440.25)).toBe((1440.25).toLocaleString('es-US', { maximumFractionDigits: 1 }))
    expect(keptNumberFormat('en-US', { maximumFractionDigits: 2 })).not.toBe(keptNumberFormat('en-US', { maximumFractionDigits: 1 }))
  })
})
