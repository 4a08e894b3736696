// The parts of Apache ECharts a report draws with, and no more: bar and line charts, their axes, legend,
// title and tooltip, drawn as SVG. Imported only by ReportChart.vue, lazily, so no other page loads it.
import { init, use } from 'echarts/core'
import { BarChart, LineChart } from 'echarts/charts'
import { GridComponent, LegendComponent, TitleComponent, TooltipComponent } from 'echarts/components'
import { SVGRenderer } from 'echarts/renderers'

use([BarChart, LineChart, GridComponent, LegendComponent, TitleComponent, TooltipComponent, SVGRenderer])

/** A chart on `el`, drawn as SVG (sharp at any zoom, and selectable text). */
export function drawChart(el: HTMLElement) {
  return init(el, null, { renderer: 'svg' })
}
