import { describe, expect, it } from 'vitest'
import * as echarts from 'echarts'
import { chartData, chartOption, highest } from '../../shared/utils/report-chart'

// A chart of many things draws the highest few; the table under it lists all. The option the browser draws
// with is checked by Apache ECharts itself, drawing it on the server as SVG.
describe('report charts of many things', () => {
  const spec = { kind: 'bar' as const, unit: 'kWh', categories: ['A', 'B', 'C', 'D'], series: [{ name: 'kWh', data: [5, null, 9, 7] }, { name: 'cost', data: [1, 2, 3, 4] }] }
  const drawn = (option: object) => {
    const chart = echarts.init(null, null, { renderer: 'svg', ssr: true, width: 480, height: 300 })
    chart.setOption(option)
    const svg = chart.renderToSVGString()
    chart.dispose()
    return svg
  }

  it('keeps the top categories by the first series, highest first, and their values in every series', () => {
    expect(highest({ ...spec, top: 2 })).toMatchObject({ categories: ['C', 'D'], series: [{ data: [9, 7] }, { data: [3, 4] }] })
    expect(highest({ ...spec, top: 10 })).toEqual({ ...spec, top: 10 })
    expect(highest(spec)).toBe(spec)
  })

  it('says over the chart that it shows the highest of how many, and sends no drawing for nothing to draw', () => {
    expect(chartData({ ...spec, top: 2 })).toEqual({ kind: 'bar', unit: 'kWh', categories: ['C', 'D'], series: [{ name: 'kWh', data: [9, 7] }, { name: 'cost', data: [3, 4] }], note: 'The 2 highest of 4; the table lists all' })
    expect(chartData({ ...spec, top: 2, topNote: (n, all) => `${n} de ${all}` })?.note).toBe('2 de 4')
    expect(chartData(spec)?.note).toBeUndefined()
    expect(chartData({ ...spec, categories: [] })).toBeNull()
    expect(chartData({ ...spec, series: [{ name: 'kWh', data: [0, null, 0, 0] }] })).toBeNull()
  })

  it('is an option ECharts draws: the note, the legend, the bars and the second axis of a line', () => {
    const svg = drawn(chartOption(chartData({ ...spec, top: 2 })!, 480))
    expect(svg).toMatch(/^<svg[\s\S]*<\/svg>$/)
    expect(svg).toContain('The 2 highest of 4; the table lists all')
    expect(svg).toContain('cost')
    const twoAxes = chartOption({ kind: 'bar', unit: 'kWh', secondUnit: '$', categories: ['Jan', 'Feb'], series: [{ name: 'kWh', data: [10, 20] }, { name: 'cost', data: [1.5, 3], type: 'line' }] }, 360)
    expect(twoAxes.yAxis).toHaveLength(2)
    expect(twoAxes.series[1]).toMatchObject({ type: 'line', yAxisIndex: 1 })
    expect(drawn(twoAxes)).toContain('$')
  })

  it('a line of whole numbers (a share in whole per cent) gets whole-number ticks on its own axis', () => {
    const share = chartOption({ kind: 'bar', unit: 'swaps', secondUnit: '%', categories: ['06', '07', '08'], series: [{ name: 'short', data: [1, 3, 2] }, { name: 'share', type: 'line', data: [0, 1, null] }] }, 480)
    expect(share.yAxis[1]).toMatchObject({ minInterval: 1 })
    expect(drawn(share)).not.toMatch(/>0\.[2468]</)
    // a line of decimals keeps ECharts' own ticks
    expect(chartOption({ kind: 'bar', unit: 'kWh', secondUnit: '$', categories: ['Jan'], series: [{ name: 'kWh', data: [10] }, { name: 'cost', data: [1.5], type: 'line' }] }, 480).yAxis[1]).toMatchObject({ minInterval: undefined })
  })

  it('starts the plot lower on a phone, where a legend of two series or more may wrap', () => {
    const two = chartData(spec)!
    expect(chartOption(two, 340).grid.top).toBeGreaterThan(chartOption(two, 700).grid.top)
    expect(chartOption({ ...two, series: [two.series[0]!] }, 340).legend.show).toBe(false)
  })
})
