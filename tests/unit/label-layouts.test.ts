import { describe, expect, it } from 'vitest'
import { unit } from 'mathjs'
import { LABEL_LAYOUTS, PAPER_POINTS, POINTS_PER_MM, labelGrid } from '../../shared/utils/label-layouts'

describe('paper sizes', () => {
  it('A4 is 210 × 297 mm (ISO 216) and Letter 8.5 × 11 in, in points checked with mathjs units', () => {
    // 1 pt = 1/72 in (PostScript point); mathjs converts in → mm
    const mmPerPoint = unit(1 / 72, 'inch').toNumber('mm')
    expect(PAPER_POINTS.a4.width * mmPerPoint).toBeCloseTo(210, 6)
    expect(PAPER_POINTS.a4.height * mmPerPoint).toBeCloseTo(297, 6)
    expect(PAPER_POINTS.letter.width * mmPerPoint).toBeCloseTo(unit(8.5, 'inch').toNumber('mm'), 6)
    expect(1 / POINTS_PER_MM).toBeCloseTo(mmPerPoint, 9)
  })
})

describe('labelGrid', () => {
  it('keeps every label on the paper and no two labels overlapping', () => {
    for (const layout of Object.keys(LABEL_LAYOUTS) as (keyof typeof LABEL_LAYOUTS)[]) {
      for (const paper of ['letter', 'a4'] as const) {
        const grid = labelGrid(250, layout, paper)
        for (const s of grid.slots) {
          expect(s.x).toBeGreaterThanOrEqual(0)
          expect(s.y).toBeGreaterThanOrEqual(0)
          expect(s.x + s.width).toBeLessThanOrEqual(grid.paper.width + 1e-9)
          expect(s.y + s.height).toBeLessThanOrEqual(grid.paper.height + 1e-9)
        }
        const first = grid.slots.filter(s => s.page === 0)
        for (let i = 0; i < first.length; i++) {
          for (let j = i + 1; j < first.length; j++) {
            const a = first[i]!
            const b = first[j]!
            const e = 1e-6
            const overlap = a.x + e < b.x + b.width && b.x + e < a.x + a.width && a.y + e < b.y + b.height && b.y + e < a.y + a.height
            expect(overlap).toBe(false)
          }
        }
        expect(grid.pages).toBe(Math.ceil(250 / grid.perPage))
      }
    }
  })

  it('fits 3 × 10 compact 2 × 1 in labels on Letter', () => {
    const grid = labelGrid(1, 'compact', 'letter')
    expect(grid.columns).toBe(3)
    expect(grid.rows).toBe(10)
  })
})
