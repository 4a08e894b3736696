import { describe, expect, it } from 'vitest'
import {
  AUDIT_PACK_MAX_DAYS, CoTwaGrouper, StandingTally, auditPackRequestSchema, cellNumber, correctionRole, correctionText,
  coTwaRow, coTwaVerdict, pageHeaderText, pageNumberText, type CorrectionFacts,
} from '../../shared/utils/audit-pack'
import { mailWords } from '../../server/utils/mail-words'

const en = mailWords('en')
const es = mailWords('es')

const SITE = '3f1c2a4e-5b6d-4e7f-8a9b-0c1d2e3f4a5b'
const facts = (over: Partial<CorrectionFacts> = {}): CorrectionFacts => ({
  correctsId: null, correctionReason: null, recordedBy: 'Dana Okafor', recordedAt: '2026-03-04 07:15',
  correctedById: null, correctedBy: null, correctedAt: null, ...over,
})

describe('audit pack request', () => {
  const parse = (from: string, to: string) => auditPackRequestSchema.safeParse({ siteId: SITE, from, to })

  it('takes a year', () => {
    expect(parse('2026-01-01', '2026-12-31').success).toBe(true)
  })

  it('refuses a reversed range with a message on "to"', () => {
    const r = parse('2026-12-31', '2026-01-01')
    expect(r.success).toBe(false)
    expect(r.error!.issues[0]).toMatchObject({ path: ['to'], message: expect.stringContaining('ends before it starts') })
  })

  it('takes three calendar years with a leap day, refuses one day more than the cap', () => {
    // 2024-01-01 … 2026-12-31 is 366 + 365 + 365 = 1,096 days
    expect(parse('2024-01-01', '2026-12-31').success).toBe(true)
    expect(AUDIT_PACK_MAX_DAYS).toBe(1098)
    expect(parse('2024-01-01', '2027-01-03').success).toBe(false)
    expect(parse('2024-01-01', '2027-01-03').error!.issues[0]!.message).toContain('at most three years')
  })

  it('refuses a date that is not a real day and a site that is not an id', () => {
    expect(parse('2026-02-30', '2026-03-01').success).toBe(false)
    expect(auditPackRequestSchema.safeParse({ siteId: 'millbrook', from: '2026-01-01', to: '2026-01-02' }).success).toBe(false)
  })
})

describe('page header and number', () => {
  it('names the site, the range, when and by whom', () => {
    expect(pageHeaderText({ siteName: 'Millbrook DC', from: '2026-01-01', to: '2026-12-31', madeAt: '2026-12-02 10:15', madeBy: 'Rosa Delgado' }, en))
      .toBe('Millbrook DC · Records 2026-01-01 to 2026-12-31 · Made 2026-12-02 10:15 by Rosa Delgado')
    expect(pageNumberText(3, 41, en)).toBe('Page 3 of 41')
  })

  it('is written in the language of the person who asked', () => {
    expect(pageHeaderText({ siteName: 'Millbrook DC', from: '2026-01-01', to: '2026-12-31', madeAt: '2026-12-02 10:15', madeBy: 'Rosa Delgado' }, es))
      .toBe('Millbrook DC · Registros del 2026-01-01 al 2026-12-31 · Hecho 2026-12-02 10:15 por Rosa Delgado')
    expect(pageNumberText(3, 41, es)).toBe('Página 3 de 41')
  })
})

describe('corrections in the pack', () => {
  it('an original replaced by a correction reads as replaced, the correction says who, when and why', () => {
    const original = facts({ correctedById: 'b', correctedBy: 'Sam Reyes', correctedAt: '2026-03-04 09:00' })
    const correction = facts({ correctsId: 'a', correctionReason: 'Wrong item ticked.', recordedBy: 'Sam Reyes', recordedAt: '2026-03-04 09:00' })
    expect(correctionRole(original)).toBe('corrected')
    expect(correctionRole(correction)).toBe('correction')
    expect(correctionRole(facts())).toBe('standing')
    expect(correctionText(original, en)).toBe('Replaced by a correction (Sam Reyes, 2026-03-04 09:00)')
    expect(correctionText(correction, en)).toBe('Correction by Sam Reyes, 2026-03-04 09:00: Wrong item ticked.')
    expect(correctionText(facts(), en)).toBe('')
  })

  it('totals count a corrected record once: 3 records, one corrected once and one corrected twice → 3 stand', () => {
    const rows = [
      facts({ correctedById: 'a2' }), facts({ correctsId: 'a1' }), // a1 → a2
      facts({ correctedById: 'b2' }), facts({ correctsId: 'b1', correctedById: 'b3' }), facts({ correctsId: 'b2' }), // b1 → b2 → b3
      facts(), // c
    ]
    const tally = new StandingTally()
    for (const r of rows) tally.add(r)
    expect(tally).toMatchObject({ standing: 3, replaced: 3, corrections: 3 })
  })
})

describe('CO 8-hour TWA by area and day', () => {
  // Hand-computed with E = Σ(C·T) / 8 h (29 CFR 1910.1000(d)(1)(i)):
  // Charging area 1, 2026-03-04: 3 h at 20 ppm + 4 h at 60 ppm + 1 h at 10 ppm → (60 + 240 + 10) / 8 = 38.75 ppm.
  // Over the 35 ppm site limit (NIOSH REL, the default), under the OSHA PEL of 50 ppm (29 CFR 1910.1000 Table Z-1).
  it('38.75 ppm: over the site limit, within the OSHA PEL 50 ppm', () => {
    const row = coTwaRow('Charging area 1', '2026-03-04', [{ ppm: 20, hours: 3 }, { ppm: 60, hours: 4 }, { ppm: 10, hours: 1 }], 35)
    expect(row).toMatchObject({ readings: 3, sampledHours: 8, peakPpm: 60, overSiteLimit: true, overOshaPel: false })
    expect(row.twaPpm).toBeCloseTo(38.75, 9)
    expect(coTwaVerdict(row, en)).toBe('Over the site limit 35 ppm')
  })

  // 2 h at 150 + 2 h at 75 + 4 h at 50 → 81.25 ppm: the worked example of 29 CFR 1910.1000(d)(1)(ii) (from memory),
  // read here against the CO PEL of 50 ppm (Table Z-1).
  it('the regulation\'s worked example, 81.25 ppm, is over the OSHA PEL 50 ppm', () => {
    const row = coTwaRow('Fuel station', '2026-03-05', [{ ppm: 150, hours: 2 }, { ppm: 75, hours: 2 }, { ppm: 50, hours: 4 }], 35)
    expect(row.twaPpm).toBeCloseTo(81.25, 9)
    expect(coTwaVerdict(row, en)).toBe('Over the OSHA PEL 50 ppm')
  })

  // 2 h at 12 ppm sampled of an 8-h shift: 24 / 8 = 3 ppm (the 6 h unsampled count as zero).
  it('groups readings streamed in area-and-day order; a replaced reading (null) is left out', () => {
    const g = new CoTwaGrouper(35)
    const out = [
      g.push('Area A', '2026-03-04', { ppm: 12, hours: 2 }),
      g.push('Area A', '2026-03-04', null),
      g.push('Area A', '2026-03-05', { ppm: 40, hours: 8 }),
      g.push('Area B', '2026-03-04', { ppm: 5, hours: 4 }),
      g.flush(),
    ].filter(r => r !== null)
    expect(out.map(r => [r.area, r.day, r.readings, r.twaPpm])).toEqual([
      ['Area A', '2026-03-04', 1, 3], // 2 h × 12 ppm / 8 h
      ['Area A', '2026-03-05', 1, 40], // 8 h × 40 ppm / 8 h
      ['Area B', '2026-03-04', 1, 2.5], // 4 h × 5 ppm / 8 h
    ])
    expect(coTwaVerdict(out[1]!, en)).toBe('Over the site limit 35 ppm')
  })

  it('writes numbers without trailing zeros', () => {
    expect(cellNumber(38.75, 1)).toBe('38.8')
    expect(cellNumber(3)).toBe('3')
    expect(cellNumber(null)).toBe('')
  })
})

describe('section rows', async () => {
  const { PACK_SECTIONS } = await import('../../server/utils/audit-pack/sections')
  const table = (file: string) => PACK_SECTIONS.flatMap(s => s.tables).find(t => t.file === file)!

  it('every table has as many cells as columns and a CSV name of its own', () => {
    const files = PACK_SECTIONS.flatMap(s => s.tables.map(t => t.file))
    expect(new Set(files).size).toBe(files.length)
    expect(PACK_SECTIONS.map(s => en(`audit_pack.pdf.section.${s.key}`))).toEqual([
      'Area logs', 'Emissions tests', 'Cylinder requalifications', 'Refused refills', 'Indoor CO readings',
      'Training, evaluations and retraining', 'Incidents and follow-ups', 'Battery-room overrides',
    ])
  })

  it('a battery change over a refused check reads the check in the pack\'s language with its number; a warning alone says so', () => {
    const row = {
      ...facts(), id: 's1', at: '2026-03-04 07:15', truck: 'MB-08', batteryIn: 'QB-1105', batteryOut: 'QB-1112', reason: 'No cooled battery in the bay; fitted warm.',
      checks: [{ code: 'still_cooling', message: 'Battery is still cooling after its charge: 40 min left.', params: { minutes: 40 } }],
    }
    const swaps = table('swap-overrides.csv')
    expect(swaps.cells(row, en)).toEqual(['2026-03-04 07:15', 'MB-08', 'QB-1105', 'QB-1112', 'Battery is still cooling after its charge: 40 min left.', 'No cooled battery in the bay; fitted warm.', 'Dana Okafor', ''])
    expect(swaps.cells(row, es)[4]).toBe('La batería se sigue enfriando después de la carga: faltan 40 min.')
    expect(swaps.cells(row, en)).toHaveLength(swaps.columns.length)
    // a check kept without a code reads as recorded; a swap with a warning and no override says so
    const warned = { ...row, batteryOut: null, reason: null, checks: [{ message: 'Qualification not on record.' }] }
    expect(swaps.cells(warned, en).slice(3, 6)).toEqual(['', 'Qualification not on record.', 'Warning only, no override'])
    // a check stored without the number its words need reads as it was recorded, not "{minutes} min left"
    const bare = { ...row, checks: [{ code: 'still_cooling', message: 'Battery is still cooling after its charge.' }] }
    expect(swaps.cells(bare, es)[4]).toBe('Battery is still cooling after its charge.')
    const charges = table('charge-overrides.csv')
    const charge = { ...facts(), id: 'c1', at: '2026-03-04 07:15', battery: 'QB-1105', charger: 'CH-3', reason: 'Matching charger down for repair.' }
    expect(charges.cells(charge, es)).toEqual(['2026-03-04 07:15', 'QB-1105', 'CH-3', 'El cargador no corresponde a la batería', 'Matching charger down for repair.', 'Dana Okafor', ''])
    expect(charges.cells(charge, en)).toHaveLength(charges.columns.length)
  })

  it('a refused refill reads when, which cylinder, why and who', () => {
    const row = { ...facts(), id: 'r1', at: '2026-03-04 07:15', cylinder: 'LP-0042', reasons: ['Past its requalification date', 'Dented collar'], failed: 'collar; dents' }
    const cells = table('refused-refills.csv').cells(row, en)
    // a failed check by its name (refill.item.dents); a key with no name stays as stored
    expect(cells).toEqual(['2026-03-04 07:15', 'LP-0042', 'Past its requalification date; Dented collar', 'collar; No dents', 'Dana Okafor', ''])
    expect(cells).toHaveLength(table('refused-refills.csv').columns.length)
  })

  it('a refused refill whose reasons kept their codes reads them in the pack\'s language', () => {
    const row = { ...facts(), id: 'r2', at: '2026-03-04 07:15', cylinder: 'LP-0042', reasons: ['Failed pre-fill inspection: No dents. Do not fill this cylinder.'], words: [{ code: 'fill_inspection_failed', params: { items: ['dents'] } }], failed: 'dents' }
    const cells = table('refused-refills.csv').cells(row, es)
    expect(cells.slice(2, 4)).toEqual(['No pasó la inspección antes del llenado: Sin abolladuras. No llene este cilindro.', 'Sin abolladuras'])
  })

  it('an area-log correction carries its reason; an unsigned log says so', () => {
    const row = {
      ...facts({ correctsId: 'e1', correctionReason: 'Eyewash was tested after all.' }), id: 'e2', period: '2026-03-04', cadence: 'daily',
      area: 'Charging area 1', item: 'Eyewash flushed', note: '', result: 'pass', signedBy: null, signedAt: null,
    }
    const cells = table('area-logs.csv').cells(row, en)
    expect(cells).toEqual(['2026-03-04 (daily)', 'Charging area 1', 'Eyewash flushed', 'Pass', 'Dana Okafor, 2026-03-04 07:15', 'Not signed',
      'Correction by Dana Okafor, 2026-03-04 07:15: Eyewash was tested after all.'])
    // in Spanish the pack's own words change; what was recorded (area, item, reason) stays as written
    expect(table('area-logs.csv').cells(row, es)).toEqual(['2026-03-04 (diaria)', 'Charging area 1', 'Eyewash flushed', 'Pasa', 'Dana Okafor, 2026-03-04 07:15', 'Sin firmar',
      'Corrección de Dana Okafor, 2026-03-04 07:15: Eyewash was tested after all.'])
  })

  it('incident kinds, qualifications and retraining reasons are said in the reader\'s language; an unknown code stays as stored', () => {
    const incident = { id: 'i1', at: '2026-03-04 07:15', kind: 'electrolyte_spill', area: 'Charging area 1', description: 'Spill at bay 3', actions: 'Neutralized', reportedBy: 'Dana Okafor', hasFollowUp: false, followUpClosedAt: null }
    expect(table('incidents.csv').cells(incident, en)[1]).toBe('Electrolyte spill')
    expect(table('incidents.csv').cells(incident, es)[1]).toBe('Derrame de electrolito')
    expect(table('incidents.csv').cells({ ...incident, kind: 'flood' }, es)[1]).toBe('flood')
    const qualification = { id: 'q1', person: 'Dana Okafor', kind: 'battery_changing', trainedOn: '2026-01-02', evaluatedOn: '2026-01-02', expiresOn: '2029-01-02', current: true, notes: '' }
    expect(table('qualifications.csv').cells(qualification, en)[1]).toBe('Battery changing')
    expect(table('qualifications.csv').cells(qualification, es)[1]).toBe('Cambio de batería')
    const retraining = { id: 'r1', day: '2026-03-04', person: 'Dana Okafor', truckClass: 1, reason: 'near_miss', recordedBy: 'Sam Reyes', recordedAt: '2026-03-04 08:00' }
    expect(table('retraining-triggers.csv').cells(retraining, es)[3]).toBe('Tuvo un casi accidente')
  })

  it('an emissions test lists its certificate, or says none was uploaded', () => {
    const base = { ...facts(), id: 't1', testedOn: '2026-05-02', truck: 'MB-07', tester: 'Invented Tailpipe Services', coIdle: 0.4, coHighIdle: 0.5, hc: 120, passed: true, reasons: [], nextDueOn: '2027-05-02' }
    expect(table('emissions-tests.csv').cells({ ...base, certificate: 'MB-07 2026.pdf' }, en)[7]).toBe('MB-07 2026.pdf')
    expect(table('emissions-tests.csv').cells({ ...base, certificate: null }, en)[7]).toBe('None uploaded')
    expect(table('emissions-tests.csv').cells({ ...base, certificate: null }, en)[5]).toBe('Pass')
  })
})
