import { describe, expect, it } from 'vitest'
import { heapGrowingPercent } from '../../server/utils/heap-growing'

// The server's start setting for V8's heap growing factor (V8 flag --heap-growing-percent, factor 1 + percent/100).
describe('BAYWARD_HEAP_GROWING_PERCENT', () => {
  it('is 100 when unset or blank', () => {
    expect(heapGrowingPercent(undefined)).toBe(100)
    expect(heapGrowingPercent(' ')).toBe(100)
  })

  it('takes a whole number from 0 to 1000', () => {
    expect(heapGrowingPercent('0')).toBe(0)
    expect(heapGrowingPercent('250')).toBe(250)
    expect(heapGrowingPercent('1000')).toBe(1000)
  })

  it('refuses anything else with the setting named', () => {
    for (const bad of ['-5', '1.5', 'lots', '1001', '1e3']) expect(() => heapGrowingPercent(bad)).toThrow(/BAYWARD_HEAP_GROWING_PERCENT is "/)
  })
})
