// The normal distribution function and the probability of conformity (JCGM 106:2012, 7.4), against
// scipy values and published table values.
import { describe, expect, it } from 'vitest'
import {
  decideConformity,
  EngineInputError,
  erfc,
  evaluateConformity,
  normalCdf,
  normalIntervalProbability,
  normalSf,
  probabilityOfConformity,
} from '../../../shared/uncertainty'

// Reference values: tests/reference/normal_conformity.py (scipy 1.17: scipy.special.erfc and
// scipy.stats.norm for the conformity cases; mpmath.ncdf at 40 digits for Φ and Q), pasted from its output.
const ERFC: [number, number][] = [
  [0.0, 1.0],
  [1e-08, 0.9999999887162083],
  [0.1, 0.8875370839817152],
  [0.5, 0.4795001221869535],
  [1.0, 0.15729920705028516],
  [1.5, 0.03389485352468927],
  [1.9999, 0.00467980209297061],
  [2.0, 0.004677734981047266],
  [2.0001, 0.0046756686958033394],
  [2.5, 0.00040695201744495886],
  [3.0, 2.2090496998585445e-05],
  [4.0, 1.541725790028002e-08],
  [5.0, 1.5374597944280347e-12],
  [6.0, 2.1519736712498913e-17],
  [8.0, 1.1224297172982928e-29],
  [10.0, 2.0884875837625446e-45],
  [15.0, 7.212994172451209e-100],
  [20.0, 5.395865611607901e-176],
  [26.0, 5.663192408856145e-296],
  [-0.5, 1.5204998778130465],
  [-2.5, 1.999593047982555],
]
const CDF: [number, number, number][] = [
  [-37.0, 5.725571222524577e-300, 1.0],
  [-30.0, 4.906713927148187e-198, 1.0],
  [-20.0, 2.7536241186062337e-89, 1.0],
  [-10.0, 7.619853024160525e-24, 1.0],
  [-8.0, 6.220960574271784e-16, 0.9999999999999993],
  [-6.0, 9.86587645037698e-10, 0.9999999990134123],
  [-5.0, 2.866515718791939e-07, 0.9999997133484281],
  [-3.0, 0.0013498980316300946, 0.9986501019683699],
  [-2.0, 0.02275013194817921, 0.9772498680518208],
  [-1.96, 0.024997895148220435, 0.9750021048517795],
  [-1.0, 0.15865525393145705, 0.8413447460685429],
  [-0.5, 0.3085375387259869, 0.6914624612740131],
  [0.0, 0.5, 0.5],
  [0.5, 0.6914624612740131, 0.3085375387259869],
  [1.0, 0.8413447460685429, 0.15865525393145705],
  [1.959963984540054, 0.975, 0.025000000000000012],
  [3.0, 0.9986501019683699, 0.0013498980316300946],
]
const POC: [number, number, number, number, number][] = [
  [0.0, 0.5, -1.0, 1.0, 0.9544997361036416],
  [0.8, 0.15, -1.0, 1.0, 0.9087887802741321],
  [1.0, 0.25, -1.0, 1.0, 0.4999999999999994],
  [-1.3, 0.2, -1.0, 1.0, 0.06680720126885807],
  [0.25, 0.125, -1.0, 1.0, 0.9999999990134123],
  [3.0, 0.25, -1.0, 1.0, 6.22096057427174e-16],
  [0.0, 0.1, -1.0, 1.0, 1.0],
  [0.2, 0.3, -0.5, 2.0, 0.990184670384767],
]

const rel = (a: number, b: number): number => (b === 0 ? Math.abs(a) : Math.abs(a - b) / Math.abs(b))

describe('erfc and Φ', () => {
  it('erfc agrees with scipy.special.erfc to 1e-13 relative, from 0 to 26 and for negative x', () => {
    for (const [x, v] of ERFC) expect(rel(erfc(x), v), `erfc(${x})`).toBeLessThan(1e-13)
  })

  it('Φ and Q = 1 − Φ agree with mpmath.ncdf to 2e-14 relative down to Φ(−37) ≈ 5.7e-300', () => {
    for (const [z, cdf, sf] of CDF) {
      expect(rel(normalCdf(z), cdf), `Φ(${z})`).toBeLessThan(2e-14)
      expect(rel(normalSf(z), sf), `Q(${z})`).toBeLessThan(2e-14)
      expect(rel(normalSf(-z), cdf), `Q(${-z})`).toBeLessThan(2e-14)
    }
  })

  it('reproduces published table values of Φ', () => {
    // Abramowitz & Stegun Table 26.1 to 10 decimals: Φ(1) = 0.8413447461, Φ(2) = 0.9772498681, Φ(3) = 0.9986501020;
    // the 97.5 % point 1.959963985 (standard normal quantile tables). The entries were recalled; each is
    // scipy.stats.norm.cdf (and norm.ppf(0.975) = 1.959963984540054) rounded to those decimals, checked by
    // tests/reference/published_tables.py (scipy 1.17.1).
    expect(Math.abs(normalCdf(1) - 0.8413447461)).toBeLessThan(1e-10)
    expect(Math.abs(normalCdf(2) - 0.9772498681)).toBeLessThan(1e-10)
    expect(Math.abs(normalCdf(3) - 0.998650102)).toBeLessThan(1e-9)
    expect(Math.abs(normalCdf(1.959963985) - 0.975)).toBeLessThan(1e-10)
    expect(normalCdf(Number.NEGATIVE_INFINITY)).toBe(0)
    expect(normalCdf(Number.POSITIVE_INFINITY)).toBe(1)
    expect(Number.isNaN(normalCdf(Number.NaN))).toBe(true)
  })

  it('an interval probability keeps its digits in either tail', () => {
    // Φ(−5) − Φ(−6) from the scipy values above: 2.866515718791933e-07 − 9.865876450376946e-10
    expect(rel(normalIntervalProbability(-6, -5), 2.866515718791933e-7 - 9.865876450376946e-10)).toBeLessThan(1e-12)
    expect(rel(normalIntervalProbability(5, 6), 2.866515718791933e-7 - 9.865876450376946e-10)).toBeLessThan(1e-12)
    expect(normalIntervalProbability(1, -1)).toBe(0)
  })
})

describe('probability of conformity (JCGM 106:2012, 7.4, normal PDF)', () => {
  it('agrees with scipy.stats.norm for inside, near-limit, outside and asymmetric cases', () => {
    for (const [error, standardUncertainty, lowerLimit, upperLimit, p] of POC) {
      expect(rel(probabilityOfConformity({ error, standardUncertainty, lowerLimit, upperLimit }), p), `E = ${error}, u = ${standardUncertainty}`).toBeLessThan(1e-12)
    }
  })

  it('on a limit the probability is one half less the far tail; at the centre with TL = 2u it is 95.45 %', () => {
    // JCGM 106 7.4 with a symmetric interval: p = 2Φ(TL/u) − 1; TL = 2u gives 0.9544997 (GUM's "k = 2" level)
    expect(Math.abs(probabilityOfConformity({ error: 0, standardUncertainty: 0.5, lowerLimit: -1, upperLimit: 1 }) - 0.9544997361036416)).toBeLessThan(1e-15)
    expect(Math.abs(probabilityOfConformity({ error: 1, standardUncertainty: 0.25, lowerLimit: -1, upperLimit: 1 }) - 0.5)).toBeLessThan(1e-14)
  })

  it('one-sided limits and u = 0', () => {
    // one upper limit: p = Φ((T_U − E)/u); Φ(1) = 0.8413447460685429 (scipy above)
    expect(rel(probabilityOfConformity({ error: 0, standardUncertainty: 1, upperLimit: 1 }), 0.8413447460685429)).toBeLessThan(1e-14)
    expect(rel(probabilityOfConformity({ error: 0, standardUncertainty: 1, lowerLimit: -1, upperLimit: null }), 0.8413447460685429)).toBeLessThan(1e-14)
    expect(probabilityOfConformity({ error: 0.5, standardUncertainty: 0, lowerLimit: -1, upperLimit: 1 })).toBe(1)
    expect(probabilityOfConformity({ error: 1, standardUncertainty: 0, lowerLimit: -1, upperLimit: 1 })).toBe(1)
    expect(probabilityOfConformity({ error: 1.01, standardUncertainty: 0, lowerLimit: -1, upperLimit: 1 })).toBe(0)
  })

  it('rejects bad inputs with their field names', () => {
    const field = (f: () => unknown): string => {
      try {
        f()
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field(() => probabilityOfConformity({ error: Number.NaN, standardUncertainty: 1, lowerLimit: -1, upperLimit: 1 }))).toBe('error')
    expect(field(() => probabilityOfConformity({ error: 0, standardUncertainty: -1, lowerLimit: -1, upperLimit: 1 }))).toBe('standardUncertainty')
    expect(field(() => probabilityOfConformity({ error: 0, standardUncertainty: 1, lowerLimit: 1, upperLimit: -1 }))).toBe('upperLimit')
    expect(field(() => probabilityOfConformity({ error: 0, standardUncertainty: 1 }))).toBe('upperLimit')
    expect(field(() => probabilityOfConformity({ error: 0, standardUncertainty: 1, lowerLimit: Number.NEGATIVE_INFINITY, upperLimit: 1 }))).toBe('lowerLimit')
    expect(field(() => decideConformity({ error: 0, expandedUncertainty: 0.5, tolerance: 1, rule: 'guard-band', coverageFactor: 0 }))).toBe('coverageFactor')
  })

  it('is attached to the decision with u = U/k or a given u, and is null without either', () => {
    // E = 0.8, U = 0.3, k = 2 → u = 0.15, TL = 1: the scipy case [0.8, 0.15, −1, 1] above
    const withK = decideConformity({ error: 0.8, expandedUncertainty: 0.3, tolerance: 1, rule: 'non-binary', coverageFactor: 2 })
    expect(withK.verdict).toBe('conditional-pass')
    expect(rel(withK.probabilityOfConformity!, 0.9087887802741321)).toBeLessThan(1e-12)
    const withU = evaluateConformity({ spec: { kind: 'absolute', b: 1 }, readingK: 373.15, error: 0.8, expandedUncertainty: 0.3, rule: 'guard-band', standardUncertainty: 0.15 })
    expect(rel(withU.probabilityOfConformity!, 0.9087887802741321)).toBeLessThan(1e-12)
    expect(decideConformity({ error: 0.8, expandedUncertainty: 0.3, tolerance: 1, rule: 'simple-acceptance' }).probabilityOfConformity).toBeNull()
  })
})
