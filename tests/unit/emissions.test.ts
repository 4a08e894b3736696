import { describe, it, expect } from 'vitest'
import {
  DEFAULT_EMISSIONS_POLICY,
  assessEmissionsTest,
  nextEmissionsDue,
  type EmissionsReadings,
} from '../../shared/utils/emissions'

function readings(overrides: Partial<EmissionsReadings> = {}): EmissionsReadings {
  return { fuel: 'lp_gas', coIdlePercent: 0.4, coHighIdlePercent: 0.5, hcPpm: 120, co2Percent: 12.5, o2Percent: 1.2, ...overrides }
}

describe('CO caps (Minnesota Rules 5205.0116: 1 % propane, 2 % gasoline, at idle and three-quarter throttle)', () => {
  it('policy defaults carry the rule\'s caps', () => {
    expect(DEFAULT_EMISSIONS_POLICY.maxCoPercentLp).toBe(1)
    expect(DEFAULT_EMISSIONS_POLICY.maxCoPercentGasoline).toBe(2)
    expect(DEFAULT_EMISSIONS_POLICY.maxCoPercentDiesel).toBeNull()
  })

  it('a well-tuned LP truck at about 0.4 % CO passes (trade magazine figure)', () => {
    expect(assessEmissionsTest(readings())).toMatchObject({ pass: true, reasons: [], judgedOnCo: true })
  })

  it('LP truck at 1.0 % passes, 1.1 % at high idle fails', () => {
    expect(assessEmissionsTest(readings({ coIdlePercent: 1, coHighIdlePercent: 1 })).pass).toBe(true)
    const v = assessEmissionsTest(readings({ coHighIdlePercent: 1.1 }))
    expect(v.pass).toBe(false)
    expect(v.reasons).toHaveLength(1)
    expect(v.reasons[0]).toContain('high idle')
  })

  it('gasoline truck judged at 2 %', () => {
    expect(assessEmissionsTest(readings({ fuel: 'gasoline', coIdlePercent: 1.8, coHighIdlePercent: 2 })).pass).toBe(true)
    expect(assessEmissionsTest(readings({ fuel: 'gasoline', coIdlePercent: 2.5 })).pass).toBe(false)
  })

  it('diesel is not judged on CO % by default', () => {
    const v = assessEmissionsTest(readings({ fuel: 'diesel', coIdlePercent: 3, coHighIdlePercent: null }))
    expect(v).toMatchObject({ pass: true, judgedOnCo: false })
    expect(v.notes).toHaveLength(1)
  })

  it('a site policy may set a diesel cap', () => {
    const policy = { ...DEFAULT_EMISSIONS_POLICY, maxCoPercentDiesel: 0.5 }
    expect(assessEmissionsTest(readings({ fuel: 'diesel', coIdlePercent: 0.6 }), policy).pass).toBe(false)
  })

  it('a missing or impossible reading fails with a reason', () => {
    const missing = assessEmissionsTest(readings({ coIdlePercent: undefined }))
    expect(missing.pass).toBe(false)
    expect(missing.reasons[0]).toContain('not recorded')
    expect(assessEmissionsTest(readings({ coIdlePercent: -0.1 })).pass).toBe(false)
    expect(assessEmissionsTest(readings({ o2Percent: 120 })).pass).toBe(false)
  })
})

describe('next test date', () => {
  it('passed: one year on (Feb 29 → Feb 28)', () => {
    expect(nextEmissionsDue('2026-05-14', true)).toBe('2027-05-14')
    expect(nextEmissionsDue('2028-02-29', true)).toBe('2029-02-28')
  })

  it('failed: retest within the 30-day site window', () => {
    expect(nextEmissionsDue('2026-05-14', false)).toBe('2026-06-13')
    expect(nextEmissionsDue('2026-05-14', false, { ...DEFAULT_EMISSIONS_POLICY, retestDays: 14 })).toBe('2026-05-28')
  })
})
