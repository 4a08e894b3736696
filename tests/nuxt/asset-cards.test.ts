import { describe, expect, it } from 'vitest'
import { ASSET_VIEWS, formatCardCell, formatCell, inSentence } from '../../app/utils/asset-views'

// On a phone an asset is a card whose second line is three values with no column head above them, so a number
// in a fixed unit carries the unit's symbol (SI: V, A, h; Ah as the trade writes a battery's capacity).
const card = (kind: keyof typeof ASSET_VIEWS, item: Record<string, unknown>, units: 'us' | 'metric' = 'us') =>
  ASSET_VIEWS[kind].columns.slice(1, 4).map(c => formatCardCell(item[c.key], c, units)).join(' · ')

describe('asset cards', () => {
  it('a battery reads its volts and ampere-hours', () => {
    expect(card('battery', { voltage: 24, capacityAh: 510, chemistry: 'flooded_lead_acid' })).toBe('24 V · 510 Ah · Flooded lead-acid')
  })

  it('a charger reads volts and amperes; an unknown value stays a dash without a unit', () => {
    expect(card('charger', { outputVoltage: 48, maxCurrentA: null, chargerType: undefined })).toBe('48 V · — · —')
  })

  it('a converted measure keeps its own unit and gains no second one', () => {
    const weight = ASSET_VIEWS.battery.columns.find(c => c.key === 'weightLb')!
    expect(formatCardCell(1000, weight, 'us')).toBe(formatCell(1000, weight, 'us'))
    expect(formatCardCell(1000, weight, 'metric')).toBe('454 kg') // 1 lb = 0.45359237 kg, exact by definition
  })

  it('the desktop table keeps the bare number under its head', () => {
    const volts = ASSET_VIEWS.battery.columns.find(c => c.key === 'voltage')!
    expect(formatCell(24, volts, 'us')).toBe('24')
  })

  it('a list of closed values reads by their names (a truck\'s allowed chemistries), not as codes', () => {
    const allowed = ASSET_VIEWS.truck.fields.find(f => f.key === 'allowedChemistries')!
    expect(formatCell(['flooded_lead_acid', 'lithium_ion'], allowed, 'us')).toBe('Flooded lead-acid, Lithium-ion')
    expect(formatCell([], allowed, 'us')).toBe('—')
  })

  it('a year is written as is, without digit grouping', () => {
    const made = ASSET_VIEWS.cylinder.columns.find(c => c.key === 'manufactureYear')!
    expect(formatCell(2014, made, 'us')).toBe('2014')
    expect(formatCell(2014, ASSET_VIEWS.cylinder.fields.find(f => f.key === 'manufactureYear')!, 'us')).toBe('2014')
  })

  it('a page name inside a sentence loses its capital, an acronym keeps its capitals', () => {
    expect(inSentence('Batteries')).toBe('batteries')
    expect(inSentence('LP cylinders')).toBe('LP cylinders')
    expect(inSentence('Cilindros de gas LP')).toBe('cilindros de gas LP')
    expect(inSentence('Áreas')).toBe('áreas')
  })
})
