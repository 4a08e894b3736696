import { describe, it, expect } from 'vitest'
import {
  CO_LIMITS,
  assessCoExposure,
  mixtureExposure,
  timeWeightedAverage8h,
  type CoReading,
} from '../../shared/utils/co-exposure'

const reading = (ppm: number, hours: number): CoReading => ({ ppm, hours })

describe('8-hour TWA, 29 CFR 1910.1000(d)(1)(i)', () => {
  it('worked example: (2 h × 150 + 2 h × 75 + 4 h × 50) / 8 = 81.25 ppm', () => {
    const twa = timeWeightedAverage8h([reading(150, 2), reading(75, 2), reading(50, 4)])
    expect(twa.twaPpm).toBeCloseTo(81.25, 9)
    expect(twa.totalHours).toBe(8)
    expect(twa.unsampledHours).toBe(0)
    expect(twa.exceedsEightHours).toBe(false)
  })

  it('counts unsampled time as zero exposure, still dividing by 8', () => {
    const twa = timeWeightedAverage8h([reading(40, 4)])
    expect(twa.twaPpm).toBeCloseTo(20, 9)
    expect(twa.unsampledHours).toBe(4)
  })

  it('a 10-hour shift still divides by 8 and is flagged', () => {
    const twa = timeWeightedAverage8h([reading(40, 10)])
    expect(twa.twaPpm).toBeCloseTo(50, 9)
    expect(twa.exceedsEightHours).toBe(true)
  })

  it('rejects negative readings', () => {
    expect(() => timeWeightedAverage8h([reading(-1, 2)])).toThrow(RangeError)
    expect(() => timeWeightedAverage8h([reading(10, -2)])).toThrow(RangeError)
  })
})

describe('mixtures, 29 CFR 1910.1000(d)(2)(i)', () => {
  it('worked example: 500/1000 + 45/200 + 40/200 = 0.925', () => {
    expect(mixtureExposure([
      { concentration: 500, limit: 1000 },
      { concentration: 45, limit: 200 },
      { concentration: 40, limit: 200 },
    ])).toBeCloseTo(0.925, 9)
  })

  it('rejects a zero limit', () => {
    expect(() => mixtureExposure([{ concentration: 1, limit: 0 }])).toThrow(RangeError)
  })
})

describe('CO limits', () => {
  it('OSHA PEL 50 ppm (1910.1000 Table Z-1); NIOSH REL 35, ceiling 200; ACGIH TLV 25; IDLH 1,200', () => {
    expect(CO_LIMITS.oshaPel.ppm).toBe(50)
    expect(CO_LIMITS.nioshRel.ppm).toBe(35)
    expect(CO_LIMITS.nioshCeiling.ppm).toBe(200)
    expect(CO_LIMITS.acgihTlv.ppm).toBe(25)
    expect(CO_LIMITS.idlh.ppm).toBe(1200)
    expect(CO_LIMITS.oshaPel.source).toContain('Table Z-1')
  })
})

describe('assessing a shift of indoor CO readings', () => {
  it('the 81.25 ppm worked example is over the 50 ppm PEL and the 35 ppm default site limit', () => {
    const a = assessCoExposure([reading(150, 2), reading(75, 2), reading(50, 4)])
    expect(a.twaPpm).toBeCloseTo(81.25, 9)
    expect(a.overOshaPel).toBe(true)
    expect(a.overSiteLimit).toBe(true)
    expect(a.siteLimitPpm).toBe(35)
    expect(a.ceilingExceeded).toBe(false)
    expect(a.peakPpm).toBe(150)
  })

  it('a TWA equal to the limit complies', () => {
    const a = assessCoExposure([reading(35, 8)])
    expect(a.twaPpm).toBeCloseTo(35, 9)
    expect(a.overSiteLimit).toBe(false)
    expect(a.overOshaPel).toBe(false)
  })

  it('a brief peak above the 200 ppm NIOSH ceiling is flagged even when the TWA is low', () => {
    const a = assessCoExposure([reading(10, 7.9), reading(210, 0.1)], { siteLimitPpm: 25 })
    expect(a.twaPpm).toBeCloseTo((10 * 7.9 + 210 * 0.1) / 8, 9)
    expect(a.overSiteLimit).toBe(false)
    expect(a.ceilingExceeded).toBe(true)
    expect(a.peakPpm).toBe(210)
    expect(a.atOrAboveIdlh).toBe(false)
  })

  it('no readings → zero, nothing exceeded', () => {
    const a = assessCoExposure([])
    expect(a.twaPpm).toBe(0)
    expect(a.peakPpm).toBe(0)
    expect(a.overOshaPel || a.overSiteLimit || a.ceilingExceeded).toBe(false)
  })
})
