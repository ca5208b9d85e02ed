/**
 * The laboratory's capability check in the review of a request (ISO/IEC 17025 7.1.1 c): can the
 * chosen procedure calibrate these instruments at these points — is each point inside the
 * procedure's range and covered by a CMC entry, inside each instrument's range, and does each
 * instrument's band lie inside the band the procedure covers? Pure; the review stores the findings.
 */
import type { CapabilityFinding } from '../types/requests'
import type { CmcEntry, ProcedureApplicability } from '../types/runs'
import { kelvinToCelsiusText } from '../format'

export interface CapabilityInstrument {
  id: number
  label: string
  rangeMinK: number
  rangeMaxK: number
  /** The instrument's band (µm), or null when only a responsivity table is known (its support is used). */
  bandMinUm: number | null
  bandMaxUm: number | null
}

/**
 * Findings of the capability check; every finding with `ok: false` is a reason the laboratory
 * cannot offer these terms.
 * @param pointsK - calibration points, K
 * @param applicability - what the procedure applies to (null: not stated — nothing can be checked)
 * @param cmc - the procedure's CMC ranges (K, k = 2)
 * @param instruments - the instruments of the request
 * @example checkCapability({ pointsK: [373.15], applicability: { sourceKinds: ['flat-plate'], bandMinUm: 7, bandMaxUm: 15, minK: 253.15, maxK: 773.15 },
 *   cmc: [{ minK: 250, maxK: 800, expandedUncertaintyK: 0.6 }], instruments: [] }).every(f => f.ok) === true
 */
export function checkCapability(input: { pointsK: readonly number[], applicability: ProcedureApplicability | null, cmc: readonly CmcEntry[], instruments: readonly CapabilityInstrument[] }): CapabilityFinding[] {
  const out: CapabilityFinding[] = []
  const a = input.applicability
  if (!a) {
    out.push({ instrumentId: null, pointK: null, ok: false, message: 'The procedure does not state the sources, band and range it applies to: the laboratory cannot check its capability with it' })
    return out
  }
  for (const t of input.pointsK) {
    const inRange = t >= a.minK && t <= a.maxK
    out.push({ instrumentId: null, pointK: t, ok: inRange, message: inRange ? `${kelvinToCelsiusText(t)} is inside the procedure's range` : `${kelvinToCelsiusText(t)} is outside the procedure's range (${kelvinToCelsiusText(a.minK)} to ${kelvinToCelsiusText(a.maxK)})` })
    const cmc = input.cmc.filter(r => t >= r.minK && t <= r.maxK)
    out.push({ instrumentId: null, pointK: t, ok: cmc.length > 0, message: cmc.length ? `CMC at ${kelvinToCelsiusText(t)}: ${Math.max(...cmc.map(r => r.expandedUncertaintyK))} K (k = 2)` : `No CMC covers ${kelvinToCelsiusText(t)}` })
  }
  for (const i of input.instruments) {
    if (i.bandMinUm !== null && i.bandMaxUm !== null) {
      const fits = i.bandMinUm >= a.bandMinUm && i.bandMaxUm <= a.bandMaxUm
      out.push({ instrumentId: i.id, pointK: null, ok: fits, message: fits ? `${i.label}: band ${i.bandMinUm}–${i.bandMaxUm} µm is covered by the procedure` : `${i.label}: band ${i.bandMinUm}–${i.bandMaxUm} µm is outside the procedure's ${a.bandMinUm}–${a.bandMaxUm} µm` })
    }
    for (const t of input.pointsK) {
      if (t < i.rangeMinK || t > i.rangeMaxK) out.push({ instrumentId: i.id, pointK: t, ok: false, message: `${i.label}: ${kelvinToCelsiusText(t)} is outside its range (${kelvinToCelsiusText(i.rangeMinK)} to ${kelvinToCelsiusText(i.rangeMaxK)})` })
    }
  }
  return out
}
