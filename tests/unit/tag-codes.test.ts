import { describe, expect, it } from 'vitest'
import { normalizeTagCode, tagKind, tagUrl } from '../../shared/utils/tag-codes'

describe('normalizeTagCode', () => {
  it.each([
    ['B-00012', 'B-00012'], ['b-00012', 'B-00012'], ['b12', 'B-00012'], [' T 7 ', 'T-00007'],
    ['L-123456', 'L-123456'], ['https://bay.example/t/C-00003', 'C-00003'], ['http://localhost:3000/t/a-00001?x=1', 'A-00001'],
  ])('%s → %s', (input, code) => expect(normalizeTagCode(input)).toBe(code))

  it.each(['', 'X-00001', 'B-', 'B-12a', '12', 'DROP TABLE', '/t/'])('refuses %j', input => expect(normalizeTagCode(input)).toBeNull())
})

describe('tag kinds and URLs', () => {
  it('maps prefixes to asset kinds', () => {
    expect(['B-1', 'C-1', 'L-1', 'T-1', 'A-1'].map(tagKind)).toEqual(['battery', 'charger', 'cylinder', 'truck', 'area'])
  })
  it('builds the absolute URL a phone camera opens', () => {
    expect(tagUrl('https://bay.example/', 'B-00001')).toBe('https://bay.example/t/B-00001')
  })
})
