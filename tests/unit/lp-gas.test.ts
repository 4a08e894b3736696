import { describe, it, expect } from 'vitest'
import {
  FILLING_DENSITY_TABLE,
  PREFILL_INSPECTION_ITEMS,
  PROPANE_DEFAULT_SG,
  PROPANE_LB_PER_GAL_60F,
  assessFill,
  fillLimitLb,
  gallonsAt60F,
  maxFillingDensityPercent,
  maxLiquidVolumeGal,
  netPropaneLb,
  requiredWaterCapacityLb,
  tareLossFlagsRequalification,
  tareLossPercent,
  type FillWeights,
} from '../../shared/utils/lp-gas'

// An invented 33.5 lb truck cylinder: 80 lb water capacity, 29.6 lb tare.
function fill(overrides: Partial<FillWeights> = {}): FillWeights {
  return { waterCapacityLb: 80, tareLb: 29.6, grossBeforeLb: 31.6, grossAfterLb: 62.6, ...overrides }
}

describe('maximum filling density (29 CFR 1910.110 filling-density table as reproduced in WAC 296-307-41037 Table U-4)', () => {
  it.each([
    [0.496, 41], [0.503, 41],
    [0.504, 42], [0.508, 42], [0.510, 42],
    [0.511, 43], [0.519, 43],
    [0.520, 44], [0.527, 44],
    [0.528, 45], [0.536, 45],
  ])('SG %s at 60 °F → %s %% by weight', (sg, percent) => {
    expect(maxFillingDensityPercent(sg)).toBe(percent)
  })

  it('rounds a reading to the table\'s three decimals', () => {
    expect(maxFillingDensityPercent(0.5104)).toBe(42)
    expect(maxFillingDensityPercent(0.5106)).toBe(43)
  })

  it('gives null outside the table rather than a guess', () => {
    expect(maxFillingDensityPercent(0.495)).toBeNull()
    expect(maxFillingDensityPercent(0.537)).toBeNull()
    expect(maxFillingDensityPercent(Number.NaN)).toBeNull()
  })

  it('has contiguous rows and a default SG in the propane row', () => {
    for (let i = 1; i < FILLING_DENSITY_TABLE.length; i++) {
      expect(FILLING_DENSITY_TABLE[i]!.minSg).toBeCloseTo(FILLING_DENSITY_TABLE[i - 1]!.maxSg + 0.001, 6)
    }
    // Propane, SG 0.504–0.510 → 42 % (WAC 296-307-41037 Table U-4)
    expect(maxFillingDensityPercent(PROPANE_DEFAULT_SG)).toBe(42)
  })
})

describe('fill limit and water capacity', () => {
  it('fill limit = water capacity × 42 % for propane', () => {
    expect(fillLimitLb(100)).toBeCloseTo(42, 9)
    expect(fillLimitLb(100, 0.530)).toBeCloseTo(45, 9)
    expect(fillLimitLb(100, 0.6)).toBeNull()
    expect(fillLimitLb(-5)).toBeNull()
  })

  it('a 33.5 lb cylinder needs 79.8 lb water capacity; 43.5 lb needs 103.6 lb (trade-facts [calc] from the 42 % row)', () => {
    expect(requiredWaterCapacityLb(33.5)).toBeCloseTo(79.8, 1)
    expect(requiredWaterCapacityLb(43.5)).toBeCloseTo(103.6, 1)
  })
})

describe('maximum liquid volume, 29 CFR 1910.110(b)(19) worked example', () => {
  it('100 gal, 42 %, SG 0.510, correction 1.031 (OSHA Table H-29, 40 °F) → 79.8 gal', () => {
    const gal = maxLiquidVolumeGal(100, 42, 0.510, 1.031)
    // The regulation rounds the divisor to 52.6 before dividing: 4200 / 52.6 = 79.8 gal.
    expect(0.510 * 1.031 * 100).toBeCloseTo(52.6, 1)
    expect(gal).toBeCloseTo(4200 / 52.6, 1)
    expect(gal).toBeCloseTo(79.8, 0)
  })

  it('rejects a zero or negative input', () => {
    expect(() => maxLiquidVolumeGal(100, 42, 0, 1.031)).toThrow(RangeError)
  })
})

describe('gallons at 60 °F (4.2 lb/gal, published supplier guides)', () => {
  it('uses 4.2 lb/gal', () => {
    expect(PROPANE_LB_PER_GAL_60F).toBe(4.2)
    expect(gallonsAt60F(33.5)).toBeCloseTo(7.976, 3)
    expect(gallonsAt60F(4.2)).toBeCloseTo(1, 12)
  })
})

describe('refill by weight', () => {
  it('net propane is after minus before', () => {
    expect(netPropaneLb(31.6, 62.6)).toBeCloseTo(31, 9)
  })

  it('a fill inside the 42 % limit', () => {
    const result = assessFill(fill())
    expect(result.ok).toBe(true)
    if (!result.ok) return
    expect(result.netAddedLb).toBeCloseTo(31, 9)
    expect(result.contentsAfterLb).toBeCloseTo(33, 9)
    expect(result.fillLimitLb).toBeCloseTo(33.6, 9) // 80 lb × 42 %
    expect(result.overfilled).toBe(false)
    expect(result.overfillLb).toBe(0)
    expect(result.percentOfLimit).toBeCloseTo(33 / 33.6 * 100, 9)
    expect(result.gallonsAt60F).toBeCloseTo(33 / 4.2, 9)
  })

  it('flags an overfill and by how much', () => {
    const result = assessFill(fill({ grossAfterLb: 64.6 }))
    expect(result.ok).toBe(true)
    if (!result.ok) return
    expect(result.overfilled).toBe(true)
    expect(result.overfillLb).toBeCloseTo(1.4, 9)
  })

  it('exactly at the limit is not an overfill', () => {
    const result = assessFill(fill({ waterCapacityLb: 100, tareLb: 30, grossAfterLb: 72 }))
    expect(result.ok && result.overfilled).toBe(false)
  })

  it('returns errors, not NaN, for impossible weights', () => {
    const lighter = assessFill(fill({ grossAfterLb: 30 }))
    expect(lighter.ok).toBe(false)
    if (lighter.ok) return
    expect(lighter.errors.map(e => e.problem)).toEqual(['after_below_before'])

    const belowTare = assessFill(fill({ grossBeforeLb: 28 }))
    expect(!belowTare.ok && belowTare.errors.map(e => e.problem)).toEqual(['gross_below_tare'])

    const nan = assessFill(fill({ tareLb: Number.NaN }))
    expect(!nan.ok && nan.errors[0]).toMatchObject({ field: 'tareLb', problem: 'invalid_number' })

    const noCapacity = assessFill(fill({ waterCapacityLb: 0 }))
    expect(!noCapacity.ok && noCapacity.errors.map(e => e.problem)).toContain('water_capacity_not_positive')

    const butane = assessFill(fill({ sg: 0.58 }))
    expect(!butane.ok && butane.errors.map(e => e.problem)).toEqual(['sg_outside_table'])
  })
})

describe('tare loss (NFPA 58 annex guide: 5 % or more → requalify)', () => {
  it('computes the percent lost', () => {
    expect(tareLossPercent(30, 28.5)).toBeCloseTo(5, 9)
    expect(tareLossPercent(30, 30.3)).toBeCloseTo(-1, 9)
  })

  it('flags at 5 % and not below', () => {
    expect(tareLossFlagsRequalification(30, 28.5)).toBe(true)
    expect(tareLossFlagsRequalification(30, 28.6)).toBe(false)
  })

  it('rejects a zero stamped tare', () => {
    expect(() => tareLossPercent(0, 10)).toThrow(RangeError)
  })
})

describe('pre-fill inspection items', () => {
  it('has unique stable keys and marks the damage items as PHMSA guidance (published)', () => {
    const keys = PREFILL_INSPECTION_ITEMS.map(i => i.key)
    expect(new Set(keys).size).toBe(keys.length)
    expect(keys).toEqual([
      'dents', 'bulges', 'gouges_or_cuts', 'weld_or_fire_damage', 'corrosion_or_pitting',
      'relief_valve', 'collar_and_foot_ring', 'service_valve_and_seal', 'locating_pin', 'legible_markings',
    ])
    expect(PREFILL_INSPECTION_ITEMS.filter(i => i.basis === 'published').map(i => i.key))
      .toEqual(['dents', 'bulges', 'gouges_or_cuts', 'weld_or_fire_damage', 'corrosion_or_pitting'])
  })
})
