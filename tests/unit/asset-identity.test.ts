import { describe, expect, it } from 'vitest'
import { assetIdentity, assetIdentityIn, identityFacts } from '../../shared/utils/asset-identity'
import { mailWords } from '../../server/utils/mail-words'

// The identity line under an asset's name on its tag page and its label, in the reader's words and the
// site's units. Weights: 1 lb = 0.45359237 kg exactly (the international avoirdupois pound, 1959).
const truck = { fleetNumber: 'MB-01', truckClass: 1, power: 'electric', systemVoltage: 48, hourMeter: 12 }
const cylinder = { serial: 'C-1', waterCapacityLb: 100, tareLb: 70 }

describe('asset identity in words', () => {
  it('says in English what the English line says', () => {
    const en = mailWords('en')
    expect(assetIdentityIn('truck', truck, en, 'us')).toBe(assetIdentity('truck', truck))
    expect(assetIdentityIn('cylinder', cylinder, en, 'us')).toBe(assetIdentity('cylinder', cylinder))
  })

  it('in Spanish, and a cylinder\'s weights in kg on a metric site (100 lb = 45.359237 kg, 70 lb = 31.7514659 kg)', () => {
    const es = mailWords('es')
    expect(assetIdentityIn('truck', truck, es, 'us')).toBe('MB-01 · clase 1 · Eléctrico 48 V')
    expect(assetIdentityIn('cylinder', cylinder, es, 'metric')).toBe('CA 45.4 kg · tara 31.8 kg · C-1')
  })

  it('a tag\'s view carries only the fields the line is made of', () => {
    expect(identityFacts('truck', truck)).toEqual({ fleetNumber: 'MB-01', truckClass: 1, power: 'electric', systemVoltage: 48 })
  })
})
