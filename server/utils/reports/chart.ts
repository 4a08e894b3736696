type Echarts = typeof import('echarts')
let echarts: Echarts | undefined
/** The chart library, loaded with the first report rather than at server start (about 15 MB once loaded). */
export async function loadCharts(): Promise<void> {
  echarts ??= await import('echarts')
}

// Charts are drawn here, on the server, as SVG (Apache ECharts' server-side renderer): the page gets a
// string and ships no chart code, the Scan page's bundle is untouched, and the nonce CSP needs nothing new
// (the SVG carries no script; its inline style attributes are allowed by style-src 'unsafe-inline').
// Series take the brand violet and slates; the Z535 safety colours are kept for hazards and states.
/** How many chargers, trucks or areas a chart of many draws. */
export const CHART_TOP = 20

export const SERIES_COLOURS = ['#723d9a', '#64748b', '#a574cd', '#334155', '#c3a2e0', '#94a3b8'] as const

export interface ChartSeries {
  name: string
  data: (number | null)[]
  /** 'line' on a bar chart draws this one as a line on the second axis */
  type?: 'bar' | 'line'
}

export interface ChartSpec {
  kind: 'bar' | 'line'
  categories: string[]
  series: ChartSeries[]
  /** the left axis's name ("kWh"), and the right one's when a series is a line on a bar chart */
  unit: string
  secondUnit?: string
  stacked?: boolean
  /** a chart of many things (chargers, trucks, areas) shows the `top` highest by the first series; the table lists all */
  top?: number
  /** the words over a chart cut to its `top` (report.chart_top in the reader's language) */
  topNote?: (shown: number, all: number) => string
  width?: number
  height?: number
}

// 480 × 300 with 14 px text: on a 390 px phone it is drawn at about 0.75 scale (text ≈ 10.5 px); the page
// sets width: 100 % up to 720 px, so on a desktop it grows to 1.5 ×.
export function chartSvg(full: ChartSpec): string | null {
  if (full.categories.length === 0 || full.series.every(s => s.data.every(v => v === null || v === 0))) return null
  const spec = highest(full)
  const cut = spec.categories.length < full.categories.length
  const width = spec.width ?? 480
  const height = spec.height ?? 300
  if (!echarts) throw new Error('chartSvg before loadCharts()')
  const chart = echarts.init(null, null, { renderer: 'svg', ssr: true, width, height })
  const twoAxes = spec.kind === 'bar' && spec.series.some(s => s.type === 'line')
  // counts (batteries, swaps, tests) get whole-number ticks on the left axis
  const wholeLeft = spec.series.filter(s => !(twoAxes && s.type === 'line')).every(s => s.data.every(v => v === null || Number.isInteger(v)))
  chart.setOption({
    animation: false,
    color: [...SERIES_COLOURS],
    textStyle: { fontFamily: 'Roboto Flex, system-ui, sans-serif', fontSize: 14, color: '#334155' },
    // a legend of more than three series wraps to a second line on a phone's width
    title: cut ? { text: full.topNote ? full.topNote(spec.categories.length, full.categories.length) : `The ${spec.categories.length} highest of ${full.categories.length.toLocaleString('en-US')}; the table lists all`, left: 'right', top: 0, textStyle: { fontSize: 12, fontWeight: 'normal', color: '#64748b' } } : undefined,
    grid: { left: 8, right: 8, top: spec.series.length > 3 ? 80 : cut && spec.series.length > 1 ? 64 : 48, bottom: 8, containLabel: true },
    legend: { show: spec.series.length > 1, top: 0, textStyle: { fontSize: 13 } },
    xAxis: { type: 'category', data: spec.categories, axisLabel: { hideOverlap: true, rotate: spec.categories.length > 6 ? 45 : 0, fontSize: 13 } },
    yAxis: [
      { type: 'value', name: spec.unit, minInterval: wholeLeft ? 1 : undefined, splitLine: { lineStyle: { color: '#e2e8f0' } } },
      ...(twoAxes ? [{ type: 'value', name: spec.secondUnit ?? '', splitLine: { show: false } }] : []),
    ],
    series: spec.series.map(s => ({
      name: s.name,
      type: s.type ?? spec.kind,
      data: s.data,
      stack: spec.stacked && (s.type ?? spec.kind) === 'bar' ? 'total' : undefined,
      yAxisIndex: twoAxes && s.type === 'line' ? 1 : 0,
      symbolSize: 5,
      connectNulls: true,
      barMaxWidth: 28,
    })),
  })
  const svg = chart.renderToSVGString()
  chart.dispose()
  return svg
}

/** The spec cut to its `top` categories by the first series, highest first (drawing thousands of bars is slow and unreadable). */
export function highest(spec: ChartSpec): ChartSpec {
  if (!spec.top || spec.categories.length <= spec.top) return spec
  const first = spec.series[0]!.data
  const keep = spec.categories.map((_, i) => i).sort((a, b) => (first[b] ?? -Infinity) - (first[a] ?? -Infinity)).slice(0, spec.top)
  return { ...spec, categories: keep.map(i => spec.categories[i]!), series: spec.series.map(s => ({ ...s, data: keep.map(i => s.data[i] ?? null) })) }
}
