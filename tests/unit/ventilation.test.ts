import { describe, it, expect } from 'vitest'
import { faraday, gasConstant, unit } from 'mathjs'
import {
  EN62485_FACTOR,
  EN62485_FACTOR_NEWER_EDITION,
  GASSING_CURRENT_PER_100AH,
  VENTILATION_SCOPE_CAUTION,
  assessVentilation,
  en62485AirflowM3h,
  hydrogenCfmPerAmpPerCell,
  hydrogenEvolvedCfm,
  hydrogenPercentAtExhaust,
  naturalVentOpeningCm2,
  prescriptiveExhaustCfm,
  requiredDilutionAirCfm,
  requiredExhaustCfm,
  type GassingSource,
} from '../../shared/utils/ventilation'

const source = (overrides: Partial<GassingSource> = {}): GassingSource =>
  ({ gassingCurrentA: 20, cells: 24, batteries: 10, ...overrides })

// Significant-figure rounding for comparing against published figures.
const sig = (value: number, digits: number) => Number(value.toPrecision(digits))

describe('hydrogen per ampere per cell', () => {
  it('0.000269 cfm per A per cell at 77 °F (IEEE 484 figure) to 3 s.f.', () => {
    expect(sig(hydrogenCfmPerAmpPerCell(), 3)).toBe(0.000269)
  })

  it('matches Faraday\'s law with mathjs CODATA faraday and gasConstant', () => {
    const molPerSecond = 1 / (2 * faraday.toNumber('C/mol'))
    const m3PerSecond = molPerSecond * gasConstant.toNumber('J/(mol K)') * unit(77, 'degF').toNumber('K') / 101325
    expect(hydrogenCfmPerAmpPerCell()).toBeCloseTo(unit(m3PerSecond, 'm^3/s').toNumber('ft^3/min'), 12)
  })

  it('0.127 mL/s per A per cell (IEEE 484 figure, metric) to 3 s.f.', () => {
    expect(sig(unit(hydrogenCfmPerAmpPerCell(), 'ft^3/min').toNumber('mL/s'), 3)).toBe(0.127)
  })

  it('is lower in a colder room (ideal gas)', () => {
    expect(hydrogenCfmPerAmpPerCell(32)).toBeLessThan(hydrogenCfmPerAmpPerCell(77))
  })
})

describe('required exhaust, worked example [calc]: 10 batteries × 24 cells × 20 A', () => {
  const h2 = hydrogenEvolvedCfm([source()])

  it('evolves 1.289 cfm of hydrogen', () => {
    expect(h2).toBeCloseTo(1.289, 3)
  })

  it('needs 128.9 cfm of exhaust to hold 1 % (H2 / C)', () => {
    expect(requiredExhaustCfm(h2)).toBeCloseTo(128.9, 1)
    expect(hydrogenPercentAtExhaust(h2, requiredExhaustCfm(h2))).toBeCloseTo(1, 12)
  })

  it('dilution air H2 × (1 − C) / C is the exhaust less the hydrogen itself', () => {
    expect(requiredDilutionAirCfm(h2)).toBeCloseTo(h2 * 99, 12)
    expect(requiredDilutionAirCfm(h2) + h2).toBeCloseTo(requiredExhaustCfm(h2), 12)
  })

  it('sums several groups of batteries', () => {
    const split = hydrogenEvolvedCfm([source({ batteries: 4 }), source({ batteries: 6 })])
    expect(split).toBeCloseTo(h2, 12)
  })

  it('refuses a design concentration at or above the 4 % lower flammable limit', () => {
    expect(() => requiredExhaustCfm(h2, 0.04)).toThrow(RangeError)
    expect(() => requiredExhaustCfm(h2, 0)).toThrow(RangeError)
  })
})

describe('prescriptive exhaust (International Mechanical Code 502.4 as adopted, seen in NYC Mechanical Code 502.4.1/502.4.2)', () => {
  it('1 cfm per ft² of floor area', () => {
    expect(prescriptiveExhaustCfm(1200)).toBe(1200)
    expect(() => prescriptiveExhaustCfm(-1)).toThrow(RangeError)
  })
})

describe('EN 62485-3 traction-battery rooms (values seen in a battery maker\'s calculator page)', () => {
  it('gassing currents per 100 Ah by charger and battery type', () => {
    expect(GASSING_CURRENT_PER_100AH.iu.flooded.ampsPer100Ah).toBe(2)
    expect(GASSING_CURRENT_PER_100AH.iu.vrla.ampsPer100Ah).toBe(1)
    expect(GASSING_CURRENT_PER_100AH.iui.flooded.ampsPer100Ah).toBe(6)
    expect(GASSING_CURRENT_PER_100AH.iui.vrla.ampsPer100Ah).toBe(1.5)
    expect(GASSING_CURRENT_PER_100AH.w_taper.flooded).toEqual({ ampsPer100Ah: 7, range: [5, 7] })
  })

  it('worked example [calc]: 24 cells, 775 Ah, IU, flooded → 18.6 m³/h (0.05) or 20.5 m³/h (0.055); A = 521 cm²', () => {
    const battery = { cells: 24, gassingCurrentPer100Ah: GASSING_CURRENT_PER_100AH.iu.flooded.ampsPer100Ah!, capacityAh: 775 }
    const q = en62485AirflowM3h(battery)
    expect(q).toBeCloseTo(18.6, 6)
    expect(en62485AirflowM3h({ ...battery, factor: EN62485_FACTOR_NEWER_EDITION })).toBeCloseTo(20.5, 1)
    expect(naturalVentOpeningCm2(q)).toBeCloseTo(521, 0)
  })

  it('the 0.05 factor ≈ dilution (100 − 4) / 4 = 24 × 0.42 L H2 per Ah at 0 °C × safety factor 5 (decomposition from memory; H2 per Ah from Faraday, mathjs)', () => {
    const litresPerAh = 3600 / (2 * faraday.toNumber('C/mol')) * gasConstant.toNumber('J/(mol K)') * 273.15 / 101325 * 1000
    expect(24 * (litresPerAh / 1000) * 5).toBeCloseTo(EN62485_FACTOR, 2)
  })
})

describe('assessing installed exhaust', () => {
  it('passes each method on its own; one passing method meets the code sections', () => {
    const a = assessVentilation({ installedCfm: 600, requiredCfm: 128.9, prescriptiveCfm: 1200, roomVolumeFt3: 24000 })
    expect(a.concentration).toEqual({ requiredCfm: 128.9, pass: true, marginCfm: 600 - 128.9 })
    expect(a.prescriptive?.pass).toBe(false)
    expect(a.meetsOneMethod).toBe(true)
    expect(a.meetsAllMethods).toBe(false)
    expect(a.airChangesPerHour).toBeCloseTo(1.5, 12)
    expect(a.caution).toBe(VENTILATION_SCOPE_CAUTION)
  })

  it('fails when short on the concentration method and no area is given', () => {
    const a = assessVentilation({ installedCfm: 100, requiredCfm: 128.9 })
    expect(a.prescriptive).toBeNull()
    expect(a.meetsOneMethod).toBe(false)
    expect(a.airChangesPerHour).toBeNull()
  })

  it('the caution names NFPA 505, IFC 309 and the authority having jurisdiction', () => {
    expect(VENTILATION_SCOPE_CAUTION).toMatch(/NFPA 505/)
    expect(VENTILATION_SCOPE_CAUTION).toMatch(/IFC 309/)
    expect(VENTILATION_SCOPE_CAUTION).toMatch(/authority having jurisdiction/)
  })
})
