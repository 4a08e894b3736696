import { describe, it, expect } from 'vitest'
import { faraday, gasConstant, unit } from 'mathjs'
import { chargerGassingCurrent, chargingAreaVentilation, type VentCharger } from '../../shared/utils/ventilation-check'
import { VENTILATION_SCOPE_CAUTION } from '../../shared/utils/ventilation'

const charger = (over: Partial<VentCharger> = {}): VentCharger => ({
  id: 'c', name: 'C-1', chargerType: 'iu', gassingCurrentA: null, cells: 24, capacityAh: 775, batteryType: 'flooded', ...over,
})
const sig = (value: number, digits: number) => Number(value.toPrecision(digits))

// H2 per A per cell per minute at 77 °F and 1 atm from Faraday's law, with mathjs CODATA constants:
// n = 60 C / (2F) mol, V = nRT/p, in ft³ through mathjs units.
const F = faraday.toNumber('C / mol')
const R = gasConstant.toNumber('J / (mol K)')
const faradayCfmPerAmpCell = unit((60 / (2 * F)) * R * unit(77, 'degF').toNumber('K') / 101325, 'm^3').toNumber('ft^3')

describe('gassing current per charger', () => {
  it('IU charger, flooded, 775 Ah: 2 A per 100 Ah × 7.75 = 15.5 A (EN 62485-3, values seen in a battery maker\'s calculator page)', () => {
    expect(chargerGassingCurrent(charger())).toMatchObject({ amps: 15.5, per100Ah: 2, source: 'default' })
  })

  it('IUI flooded 6, VRLA 1.5; W (taper) flooded 5–7, the upper value (EN 62485-3)', () => {
    expect(chargerGassingCurrent(charger({ chargerType: 'iui', capacityAh: 100 })).amps).toBe(6)
    expect(chargerGassingCurrent(charger({ chargerType: 'iui', capacityAh: 100, batteryType: 'vrla' })).amps).toBe(1.5)
    const taper = chargerGassingCurrent(charger({ chargerType: 'taper', capacityAh: 100 }))
    expect(taper.amps).toBe(7)
    expect(taper.note).toContain('5–7')
  })

  it('a current entered for the charger wins over the default', () => {
    expect(chargerGassingCurrent(charger({ gassingCurrentA: 20 }))).toMatchObject({ amps: 20, source: 'entered' })
  })

  it('lithium-ion gasses nothing in normal charging (from memory) and W + VRLA has no value', () => {
    expect(chargerGassingCurrent(charger({ chargerType: 'lithium', batteryType: 'lithium' }))).toMatchObject({ amps: 0, source: 'none' })
    expect(chargerGassingCurrent(charger({ chargerType: 'taper', batteryType: 'vrla' }))).toMatchObject({ amps: 0, source: 'none' })
  })
})

describe('charging-area check against the worked examples in trade-facts.md', () => {
  it('10 chargers × 24 cells × 20 A [calc]: 1.289 cfm H2, 128.9 cfm exhaust at 1 %', () => {
    const chargers = Array.from({ length: 10 }, (_, i) => charger({ id: `c${i}`, gassingCurrentA: 20 }))
    const r = chargingAreaVentilation({ floorAreaFt2: 400, roomVolumeFt3: 6000, installedExhaustCfm: 500 }, chargers)
    expect(sig(r.h2Cfm, 4)).toBe(1.289)
    expect(sig(r.requiredExhaustCfm, 4)).toBe(128.9)
    // Faraday's law with mathjs constants, to 3 significant figures (IEEE 484 figure 0.000269)
    expect(r.h2Cfm).toBeCloseTo(faradayCfmPerAmpCell * 20 * 24 * 10, 9)
    expect(sig(faradayCfmPerAmpCell, 3)).toBe(0.000269)
    // dilution air Q = 0.000269 × I × cells × n × (1 − C) / C
    expect(r.dilutionAirCfm).toBeCloseTo(r.h2Cfm * 99, 9)
    // 1 cfm per ft² (International Mechanical Code 502.4 as adopted)
    expect(r.prescriptiveCfm).toBe(400)
    expect(r.assessment).toMatchObject({ meetsAllMethods: true, airChangesPerHour: 5 })
    expect(r.assessment!.caution).toBe(VENTILATION_SCOPE_CAUTION)
  })

  it('24 cells, 775 Ah, IU, flooded [calc]: 18.6 m³/h (0.05) or 20.5 m³/h (0.055); A = 521 cm² (EN 62485-3)', () => {
    const r = chargingAreaVentilation({ floorAreaFt2: null, roomVolumeFt3: null, installedExhaustCfm: null }, [charger()])
    expect(sig(r.en62485M3h, 3)).toBe(18.6)
    expect(sig(r.en62485NewerEditionM3h, 3)).toBe(20.5)
    expect(Math.round(r.naturalOpeningCm2)).toBe(521)
    // m³/h to cfm through mathjs units
    expect(r.en62485Cfm).toBeCloseTo(unit(r.en62485M3h, 'm^3/h').toNumber('ft^3/min'), 9)
    expect(r.assessment).toBeNull()
    expect(r.prescriptiveCfm).toBeNull()
  })

  it('fails against an exhaust below the hydrogen need; the prescriptive rate alone can still pass', () => {
    const chargers = Array.from({ length: 10 }, (_, i) => charger({ id: `c${i}`, gassingCurrentA: 20 }))
    const r = chargingAreaVentilation({ floorAreaFt2: 100, roomVolumeFt3: null, installedExhaustCfm: 110 }, chargers)
    expect(r.assessment).toMatchObject({ meetsOneMethod: true, meetsAllMethods: false })
    expect(r.assessment!.concentration.pass).toBe(false)
    expect(r.assessment!.concentration.marginCfm).toBeCloseTo(110 - r.requiredExhaustCfm, 9)
  })

  it('a 2 % design concentration halves the exhaust', () => {
    const one = chargingAreaVentilation({ floorAreaFt2: null, roomVolumeFt3: null, installedExhaustCfm: null }, [charger()], 0.01)
    const two = chargingAreaVentilation({ floorAreaFt2: null, roomVolumeFt3: null, installedExhaustCfm: null }, [charger()], 0.02)
    expect(two.requiredExhaustCfm).toBeCloseTo(one.requiredExhaustCfm / 2, 9)
  })
})
