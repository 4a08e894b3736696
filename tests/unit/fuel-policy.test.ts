import { describe, it, expect } from 'vitest'
import { unit } from 'mathjs'
import {
  LP_STORAGE_WARN_FRACTION,
  cagePropaneLb,
  cylinderRequalificationDue,
  emissionsPolicyFromSettings,
  lpStorageStanding,
  requalificationYearsFromSettings,
  type CylinderRequalificationStamp,
  type StoredCylinder,
} from '../../shared/utils/fuel-policy'
import { defaultSiteSettings } from '../../shared/utils/site-settings'
import { DEFAULT_REQUALIFICATION_YEARS } from '../../shared/utils/requalification'
import { assessEmissionsTest, nextEmissionsDue } from '../../shared/utils/emissions'
import { defaultSchedules } from '../../shared/utils/due-schedules'
import { emissionsNextDue } from '../../shared/utils/derived-subjects'
import { PROPANE_LB_PER_GAL_60F, fillLimitLb, maxFillingDensityPercent } from '../../shared/utils/lp-gas'

function stamp(over: Partial<CylinderRequalificationStamp> = {}): CylinderRequalificationStamp {
  return { manufactureYear: 2014, manufactureMonth: 3, lastRequalifiedOn: null, lastRequalificationMethod: null, ...over }
}

function stored(status: StoredCylinder['status'], nominalPropaneLb = 33.5, contentsLb: number | null = null): StoredCylinder {
  return { status, nominalPropaneLb, contentsLb }
}

describe('site requalification table (49 CFR 180.209)', () => {
  it('defaults to 12 years water jacket, 5 years external visual (published) and 7 years proof pressure (from memory)', () => {
    expect(requalificationYearsFromSettings(defaultSiteSettings())).toEqual({ water_jacket: 12, proof_pressure: 7, external_visual: 5 })
    expect(requalificationYearsFromSettings(defaultSiteSettings())).toEqual(DEFAULT_REQUALIFICATION_YEARS)
  })

  it('first due 12 years after the manufacture month (49 CFR 180.209): stamped 03-14 → 2026-03-31', () => {
    expect(cylinderRequalificationDue(stamp(), DEFAULT_REQUALIFICATION_YEARS)).toBe('2026-03-31')
  })

  it.each([
    // 49 CFR 180.209: water jacket 12 years (published)
    ['water_jacket', '2036-06-30'],
    // 49 CFR 180.209: proof pressure 7 years (from memory)
    ['proof_pressure', '2031-06-30'],
    // 49 CFR 180.209: external visual 5 years, marked "E" (published)
    ['external_visual', '2029-06-30'],
  ] as const)('requalified 2024-06 by %s → next due %s (49 CFR 180.209)', (method, due) => {
    const years = requalificationYearsFromSettings(defaultSiteSettings())
    expect(cylinderRequalificationDue(stamp({ lastRequalifiedOn: '2024-06-12', lastRequalificationMethod: method }), years)).toBe(due)
  })

  it('follows an edited site table', () => {
    const years = requalificationYearsFromSettings({ ...defaultSiteSettings(), requalYearsExternalVisual: 4 })
    expect(cylinderRequalificationDue(stamp({ lastRequalifiedOn: '2024-06-12', lastRequalificationMethod: 'external_visual' }), years)).toBe('2028-06-30')
  })
})

describe('site emissions policy (Minnesota Rules 5205.0116: 1 % LP-gas, 2 % gasoline)', () => {
  it('carries the site caps into the test verdict; the intervals are the emissions schedule\'s', () => {
    const policy = emissionsPolicyFromSettings(defaultSiteSettings())
    expect(policy.maxCoPercentLp).toBe(1)
    expect(policy.maxCoPercentGasoline).toBe(2)
    const stricter = emissionsPolicyFromSettings({ ...defaultSiteSettings(), emissionsMaxCoPctLp: 0.5 })
    expect(assessEmissionsTest({ fuel: 'lp_gas', coIdlePercent: 0.6, coHighIdlePercent: 0.4 }, stricter).pass).toBe(false)
    const schedule = defaultSchedules().find(s => s.kind === 'emissions_test')!
    // the schedule's defaults give what the product policy gives: a year on, 30 days after a fail
    expect(emissionsNextDue('2026-05-14', true, schedule)).toBe(nextEmissionsDue('2026-05-14', true))
    expect(emissionsNextDue('2026-05-14', false, schedule)).toBe(nextEmissionsDue('2026-05-14', false))
    expect(emissionsNextDue('2026-05-14', false, { ...schedule, afterFailDays: 14 })).toBe('2026-05-28')
    expect(emissionsNextDue('2026-05-14', true, { ...schedule, every: 6, everyUnit: 'month' })).toBe('2026-11-14')
  })
})

describe('LP storage against a fuel station limit', () => {
  it('warns from 80 % (product default), flags above the limit', () => {
    expect(LP_STORAGE_WARN_FRACTION).toBe(0.8)
    expect(lpStorageStanding(100, 200)).toMatchObject({ level: 'ok', percentOfLimit: 50 })
    expect(lpStorageStanding(160, 200).level).toBe('approaching')
    expect(lpStorageStanding(200, 200).level).toBe('approaching')
    expect(lpStorageStanding(200.5, 200).level).toBe('over')
    expect(lpStorageStanding(10, null)).toMatchObject({ level: 'no_limit', percentOfLimit: null })
  })

  it('rejects impossible inputs', () => {
    expect(() => lpStorageStanding(-1, 100)).toThrow(RangeError)
    expect(() => lpStorageStanding(1, 0)).toThrow(RangeError)
  })

  it('counts full cylinders at nominal propane, partial ones at their known contents, not those on trucks', () => {
    expect(cagePropaneLb([
      stored('full'), stored('full'), stored('empty'), stored('empty', 33.5, 4.5), stored('in_use'), stored('quarantined', 43.5, 12),
    ])).toBeCloseTo(33.5 * 2 + 4.5 + 12, 9)
  })
})

describe('propane figures against a general-purpose reference (mathjs units)', () => {
  it('4.2 lb/gal at 60 °F (published supplier guides) is about 0.503 kg/L, at the edge of the 0.504–0.510 propane row', () => {
    const kgPerLitre = unit(PROPANE_LB_PER_GAL_60F, 'lbm').toNumber('kg') / unit(1, 'gal').toNumber('L')
    expect(kgPerLitre).toBeCloseTo(0.503, 3)
    // WAC 296-307-41037 Table U-4: SG 0.504–0.510 → 42 %
    expect(maxFillingDensityPercent(0.504)).toBe(42)
  })

  it('a 33.5 lb cylinder with 79.8 lb water capacity (trade-facts [calc]) is at its 42 % limit, also in kg', () => {
    const limitLb = fillLimitLb(79.8)!
    expect(limitLb).toBeCloseTo(33.5, 1)
    expect(unit(limitLb, 'lbm').toNumber('kg')).toBeCloseTo(unit(79.8, 'lbm').toNumber('kg') * 0.42, 9)
  })
})
