// A report section's chart as data: the server sends the numbers (server/utils/reports/scope.ts chartOf), and
// the browser draws them with Apache ECharts (app/components/report/ReportChart.vue) from the option made
// here. With no script the table under it still shows. Series take the brand violet and slates; the Z535
// safety colours are kept for hazards and states.

/** How many chargers, trucks or areas a chart of many draws. */
export const CHART_TOP = 20

export const SERIES_COLOURS = ['#723d9a', '#64748b', '#a574cd', '#334155', '#c3a2e0', '#94a3b8'] as const

export interface ChartSeries {
  name: string
  data: (number | null)[]
  /** 'line' on a bar chart draws this one as a line on the second axis */
  type?: 'bar' | 'line'
}

/** What a section's chart shows: sent as it is to the browser. */
export interface ChartData {
  kind: 'bar' | 'line'
  categories: string[]
  series: ChartSeries[]
  /** the left axis's name ("kWh"), and the right one's when a series is a line on a bar chart */
  unit: string
  secondUnit?: string
  stacked?: boolean
  /** over a chart cut to its highest few: "The 20 highest of 140; the table lists all", in the reader's words */
  note?: string
}

export interface ChartSpec extends Omit<ChartData, 'note'> {
  /** a chart of many things (chargers, trucks, areas) shows the `top` highest by the first series; the table lists all */
  top?: number
  /** the words over a chart cut to its `top` (report.chart_top in the reader's language) */
  topNote?: (shown: number, all: number) => string
}

/** The spec cut to its `top` categories by the first series, highest first (thousands of bars are slow and unreadable). */
export function highest<T extends ChartSpec>(spec: T): T {
  if (!spec.top || spec.categories.length <= spec.top) return spec
  const first = spec.series[0]!.data
  const keep = spec.categories.map((_, i) => i).sort((a, b) => (first[b] ?? -Infinity) - (first[a] ?? -Infinity)).slice(0, spec.top)
  return { ...spec, categories: keep.map(i => spec.categories[i]!), series: spec.series.map(s => ({ ...s, data: keep.map(i => s.data[i] ?? null) })) }
}

/** What the browser draws: the spec cut to its highest few with its note in words, or null when there is nothing to draw. */
export function chartData(full: ChartSpec): ChartData | null {
  if (full.categories.length === 0 || full.series.every(s => s.data.every(v => v === null || v === 0))) return null
  const spec = highest(full)
  const cut = spec.categories.length < full.categories.length
  const note = cut ? (full.topNote ? full.topNote(spec.categories.length, full.categories.length) : `The ${spec.categories.length} highest of ${full.categories.length.toLocaleString('en-US')}; the table lists all`) : undefined
  return { kind: spec.kind, categories: spec.categories, series: spec.series, unit: spec.unit, ...(spec.secondUnit === undefined ? {} : { secondUnit: spec.secondUnit }), ...(spec.stacked ? { stacked: true } : {}), ...(note ? { note } : {}) }
}

/**
 * The ECharts option for a chart `width` pixels wide. Text is 14 px (13 on the axes); a legend of many series
 * wraps on a phone's width, so the plot starts lower there.
 */
export function chartOption(chart: ChartData, width: number) {
  const twoAxes = chart.kind === 'bar' && chart.series.some(s => s.type === 'line')
  // counts (batteries, swaps, tests) get whole-number ticks on the left axis
  const wholeLeft = chart.series.filter(s => !(twoAxes && s.type === 'line')).every(s => s.data.every(v => v === null || Number.isInteger(v)))
  // and so does the right axis when its line is whole numbers (a share rounded to whole per cent: not 0.2, 0.4 … %)
  const wholeRight = chart.series.filter(s => s.type === 'line').every(s => s.data.every(v => v === null || Number.isInteger(v)))
  const legendRows = chart.series.length < 2 ? 0 : chart.series.length > 3 || width < 420 ? 2 : 1
  const top = 24 + legendRows * 24 + (chart.note ? 20 : 0)
  return {
    animation: false,
    color: [...SERIES_COLOURS],
    textStyle: { fontFamily: 'Roboto Flex, system-ui, sans-serif', fontSize: 14, color: '#334155' },
    title: chart.note ? { text: chart.note, left: 'right', top: 0, textStyle: { fontSize: 12, fontWeight: 'normal', color: '#64748b' } } : undefined,
    tooltip: { trigger: 'axis', confine: true },
    grid: { left: 8, right: 8, top, bottom: 8, containLabel: true },
    legend: { show: chart.series.length > 1, top: chart.note ? 20 : 0, textStyle: { fontSize: 13 } },
    xAxis: { type: 'category', data: chart.categories, axisLabel: { hideOverlap: true, rotate: chart.categories.length > 6 ? 45 : 0, fontSize: 13 } },
    yAxis: [
      // an axis's name starts at its axis and runs inwards, so a long one ("batteries") is not cut at the edge
      { type: 'value', name: chart.unit, nameTextStyle: { align: 'left' }, minInterval: wholeLeft ? 1 : undefined, splitLine: { lineStyle: { color: '#e2e8f0' } } },
      ...(twoAxes ? [{ type: 'value', name: chart.secondUnit ?? '', nameTextStyle: { align: 'right' }, minInterval: wholeRight ? 1 : undefined, splitLine: { show: false } }] : []),
    ],
    series: chart.series.map(s => ({
      name: s.name,
      type: s.type ?? chart.kind,
      data: s.data,
      stack: chart.stacked && (s.type ?? chart.kind) === 'bar' ? 'total' : undefined,
      yAxisIndex: twoAxes && s.type === 'line' ? 1 : 0,
      symbolSize: 5,
      connectNulls: true,
      barMaxWidth: 28,
    })),
  }
}
