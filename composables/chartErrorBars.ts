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
