/** Plain-language renderings shared by pages, certificates and e-mails. */
import type { AccuracySpec } from './schemas/instrument'

/** A maker's accuracy specification as it would be written on a data sheet. */
export function describeAccuracy(spec: AccuracySpec): string {
  switch (spec.kind) {
    case 'absolute': return `±${spec.b} °C`
    case 'percentOfReading': return `±${spec.a} % of reading`
    case 'greaterOf': return `±${spec.a} % of reading or ±${spec.b} °C, whichever is greater`
    case 'percentPlus': return `±(${spec.a} % of reading + ${spec.b} °C)`
  }
}

/** A spectral band for display: "8–14 µm" or the responsivity table's name. */
export function describeBand(b: { bandLambda1Um: number | null, bandLambda2Um: number | null, spectralResponseName?: string | null }): string {
  if (b.bandLambda1Um !== null && b.bandLambda2Um !== null) return `${b.bandLambda1Um}–${b.bandLambda2Um} µm`
  return b.spectralResponseName ? `table: ${b.spectralResponseName}` : '—'
}
