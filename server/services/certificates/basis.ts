/**
 * What a certificate says the "reference temperature" of each source's points is, and the source
 * emissivity the reading model used — written from what the points were computed with (their stored
 * inputs), so the statement and the numbers cannot disagree (issue 13; domain notes §7).
 */
import { celsiusFixed, formatFixed } from '#shared/format'
import { SOURCE_KIND_LABELS, type SourceKind } from '#shared/registers/constants'
import type { PointResult } from '#shared/types'

const um = (v: number) => String(Number(v.toPrecision(6)))
const emissivityText = (e: number) => formatFixed(e, 4).replace(/0+$/, '').replace(/\.$/, '')

/**
 * The basis statement for one source of a run (a ratio pyrometer's: the emissivity in both of its bands).
 * @param source - the source's asset tag and kind
 * @param results - the results of the run's points on this source
 * @param referenceTags - asset tags of the reference thermometers read in it, if any
 * @returns sentences for the certificate's method section
 * @example basisStatement({ assetTag: 'BB-FP-01', kind: 'flat-plate' }, results, []) →
 *   'BB-FP-01 (flat plate): its calibration certificate states radiance temperatures in 8–14 µm … The emissivity of BB-FP-01 used in the reading model is 0.95 in the instrument’s band.'
 */
export function basisStatement(source: { assetTag: string, kind: SourceKind }, results: PointResult[], referenceTags: string[]): string {
  const kind = SOURCE_KIND_LABELS[source.kind].toLowerCase()
  const onSource = results.filter(r => r.inputs.reference.kind === 'source-correction')
  const emissivities = [...new Set(results.map(r => r.inputs.sourceEmissivity))]
  const ratio = results.find(r => r.inputs.ratio)?.inputs.ratio
  const eps = ratio
    // a ratio pyrometer: the source's emissivity in each of its two bands (issue 16)
    ? `The emissivity of ${source.assetTag} used in the two-colour model is ${emissivities.map(emissivityText).join(', ')} in band 1 and ${[...new Set(results.map(r => r.inputs.ratio?.sourceEmissivity2).filter((e): e is number => e !== undefined))].map(emissivityText).join(', ')} in band 2.`
    : `The emissivity of ${source.assetTag} used in the reading model is ${emissivities.map(emissivityText).join(', ')} in the instrument’s band.`
  const parts: string[] = []
  const first = onSource[0]?.inputs.reference
  const basis = first?.kind === 'source-correction' ? first.basis : undefined
  if (onSource.length) {
    if (basis?.kind === 'radiance-temperature') {
      const b = basis.band
      parts.push(`${source.assetTag} (${kind}): its calibration certificate states radiance temperatures in ${um(b.lambda1Um)}–${um(b.lambda2Um)} µm (wavelengths ${b.medium === 'air' ? 'in air' : 'in vacuum'}) — what an ideal instrument with emissivity setting 1 reads on the source — with the surroundings at ${celsiusFixed(basis.reflectedTemperatureK, 1)} °C. The reference temperature is that radiance temperature at the set-point, corrected as the certificate states; the source’s surface temperature in the reading model follows from it with the source emissivity in that band and those surroundings.`)
    }
    else {
      const what = basis?.kind === 'cavity-temperature' ? 'cavity temperature' : basis?.kind === 'surface-temperature' ? 'surface (contact) temperature' : 'temperature'
      parts.push(`${source.assetTag} (${kind}): its calibration certificate states the source’s ${what}; the reference temperature is that temperature at the set-point, corrected as the certificate states, and is the source temperature in the ${ratio ? 'two-colour' : 'reading'} model.`)
    }
  }
  if (referenceTags.length) parts.push(`Where a reference thermometer (${referenceTags.join(', ')}) is listed for ${source.assetTag}, the reference temperature is its reading in the source.`)
  return `${parts.join(' ')} ${eps}`
}
