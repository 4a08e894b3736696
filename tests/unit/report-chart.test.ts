import { beforeAll, describe, expect, it } from 'vitest'
import { chartSvg, highest, loadCharts } from '../../server/utils/reports/chart'

// A chart of many things draws the highest few; the table under it lists all.
describe('report charts of many things', () => {
  beforeAll(loadCharts)
  const spec = { kind: 'bar' as const, unit: 'kWh', categories: ['A', 'B', 'C', 'D'], series: [{ name: 'kWh', data: [5, null, 9, 7] }, { name: 'cost', data: [1, 2, 3, 4] }] }

  it('keeps the top categories by the first series, highest first, and their values in every series', () => {
    expect(highest({ ...spec, top: 2 })).toMatchObject({ categories: ['C', 'D'], series: [{ data: [9, 7] }, { data: [3, 4] }] })
    expect(highest({ ...spec, top: 10 })).toEqual({ ...spec, top: 10 })
    expect(highest(spec)).toBe(spec)
  })

  it('says in the drawing that it shows the highest of how many', () => {
    const svg = chartSvg({ ...spec, top: 2 })!
    expect(svg).toContain('<svg')
    expect(svg).toContain('The 2 highest of 4; the table lists all')
    expect(chartSvg(spec)).not.toContain('highest of')
  })
})
