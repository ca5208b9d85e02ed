import type { Chart, Plugin } from 'chart.js'

/** A point of a dataset drawn with error bars: x, y and the half-length u of its bar. */
export interface ErrorBarPoint { x: number, y: number, u: number }

/**
 * A chart.js plugin drawing a vertical ±u bar with caps on every point of the datasets flagged
 * `errorBars: true` (error of indication ± expanded uncertainty in the run and instrument charts).
 */
export const errorBarsPlugin: Plugin<'scatter'> = {
  id: 'bandlightErrorBars',
  afterDatasetsDraw(chart: Chart<'scatter'>) {
    const { ctx, scales } = chart
    chart.data.datasets.forEach((ds, i) => {
      if (!(ds as { errorBars?: boolean }).errorBars) return
      const meta = chart.getDatasetMeta(i)
      if (meta.hidden) return
      ctx.save()
      ctx.strokeStyle = String(ds.borderColor)
      ctx.lineWidth = 1.5
      meta.data.forEach((el, j) => {
        const d = ds.data[j] as unknown as ErrorBarPoint
        const top = scales.y!.getPixelForValue(d.y + d.u)
        const bottom = scales.y!.getPixelForValue(d.y - d.u)
        ctx.beginPath()
        ctx.moveTo(el.x, top)
        ctx.lineTo(el.x, bottom)
        ctx.moveTo(el.x - 5, top)
        ctx.lineTo(el.x + 5, top)
        ctx.moveTo(el.x - 5, bottom)
        ctx.lineTo(el.x + 5, bottom)
        ctx.stroke()
      })
      ctx.restore()
    })
  },
}

/** What every chart of the product starts from: it fills its box and does not animate. */
export const CHART_BASE = { responsive: true, maintainAspectRatio: false, animation: false as const }

/** A curve over wavelength given as {x, y} points; the tooltip follows the pointer along x. */
export const CURVE_OVER_X = { ...CHART_BASE, parsing: false as const, interaction: { mode: 'nearest' as const, intersect: false, axis: 'x' as const } }

/**
 * An error-against-reference-temperature chart: axes titled in the user's unit (differences in K,
 * or °F), the "−limit" twin of each tolerance line left out of the legend.
 */
export function errorChartOptions(unit: 'C' | 'K' | 'F', yTitle: string, tooltip: Record<string, unknown> = {}) {
  return {
    ...CHART_BASE,
    scales: {
      x: { type: 'linear' as const, title: { display: true, text: `Reference temperature / ${unit === 'K' ? 'K' : unit === 'F' ? '°F' : '°C'}` } },
      y: { type: 'linear' as const, title: { display: true, text: `${yTitle} / ${unit === 'F' ? '°F' : 'K'}` } },
    },
    plugins: {
      legend: { position: 'bottom' as const, labels: { filter: (item: { text: string }) => !item.text.startsWith('−') } },
      tooltip,
    },
  }
}
