/**
 * Set-point corrections of a blackbody source, as its calibration certificate tabulates them.
 *
 * A certificate gives, at a few set-points, the correction to add to the source's indicated
 * (set-point) temperature to obtain its radiance temperature. Between tabulated set-points the
 * correction is interpolated linearly; outside the tabulated span it is refused, because a
 * certificate says nothing about temperatures it did not cover (ISO/IEC 17025:2017 6.4.11 asks
 * that correction factors be applied as stated, which excludes extrapolating them).
 */

/** One row of a correction table: `[setPointK, correctionK]`, both in kelvin. */
export type CorrectionPoint = readonly [setPointK: number, correctionK: number]

/** Raised when a set-point lies outside the table, or the table cannot be used. */
export class CorrectionRangeError extends RangeError {
  constructor(message: string) {
    super(message)
    this.name = 'CorrectionRangeError'
  }
}

/**
 * Problems with a correction table, or an empty list when it is usable: at least one row,
 * finite numbers, set-points above 0 K and strictly increasing.
 *
 * @example tableProblems([[373.15, 0.1], [323.15, 0.2]]) // ['Set-points must increase: row 2 (323.15 K) is not above row 1']
 */
export function tableProblems(table: readonly CorrectionPoint[]): string[] {
  const problems: string[] = []
  if (table.length === 0) problems.push('The table has no rows')
  table.forEach(([t, c], i) => {
    if (!Number.isFinite(t) || t <= 0) problems.push(`Row ${i + 1}: the set-point must be a finite temperature above 0 K`)
    if (!Number.isFinite(c)) problems.push(`Row ${i + 1}: the correction must be a finite number of kelvin`)
    if (i > 0 && !(t > table[i - 1]![0])) problems.push(`Set-points must increase: row ${i + 1} (${t} K) is not above row ${i}`)
  })
  return problems
}

/**
 * The correction at a set-point, interpolated linearly between the two neighbouring rows of the
 * certificate's table; exactly the tabulated value at a tabulated set-point.
 *
 * @param table   rows `[setPointK, correctionK]`, set-points in kelvin, strictly increasing
 * @param setPointK the source's set-point, kelvin
 * @returns the correction, kelvin, to add to the set-point
 * @throws CorrectionRangeError outside the tabulated span (no extrapolation), or for an unusable table
 *
 * @example
 * correctionAt([[323.15, 0.12], [373.15, 0.20]], 348.15) // 0.16 (half-way between 0.12 K and 0.20 K)
 * correctionAt([[323.15, 0.12], [373.15, 0.20]], 400)    // throws CorrectionRangeError
 */
export function correctionAt(table: readonly CorrectionPoint[], setPointK: number): number {
  const problems = tableProblems(table)
  if (problems.length) throw new CorrectionRangeError(problems[0]!)
  if (!Number.isFinite(setPointK)) throw new CorrectionRangeError('The set-point must be a finite number of kelvin')
  const first = table[0]!
  const last = table[table.length - 1]!
  if (setPointK < first[0] || setPointK > last[0]) {
    throw new CorrectionRangeError(`${setPointK} K is outside the certificate's table (${first[0]} K to ${last[0]} K); corrections are not extrapolated`)
  }
  // Binary search for the first row at or above the set-point.
  let lo = 0
  let hi = table.length - 1
  while (lo < hi) {
    const mid = (lo + hi) >> 1
    if (table[mid]![0] < setPointK) lo = mid + 1
    else hi = mid
  }
  const upper = table[lo]!
  if (upper[0] === setPointK || lo === 0) return upper[1]
  const lower = table[lo - 1]!
  const f = (setPointK - lower[0]) / (upper[0] - lower[0])
  return lower[1] + f * (upper[1] - lower[1])
}
