/**
 * Benchmark of the calculation engine (shared/radiometry, shared/uncertainty).
 *
 *   node --import tsx scripts/bench/engine.ts          # full run (about 15 s)
 *   node --import tsx scripts/bench/engine.ts --quick  # shorter loops, Monte Carlo with 10⁵ trials
 *
 * Prints the time per operation, the target where one is set, and the speed-up over a
 * straightforward reference written here: composite Simpson with 2000 panels on the plain Planck
 * formula (and bisection on it for inversions). The reference's agreement with the engine is printed
 * too, so a fast but wrong engine would show. A benchmark, not a test: it never fails a build.
 */
import { pathToFileURL } from 'node:url'
import {
  bandRadiance,
  expectedReadingK,
  prepareBand,
  readingModel,
  temperatureFromRadiance,
  type Band,
  type ReadingInput,
} from '../../shared/radiometry'
import { evaluateBudget, runMonteCarlo, type BudgetComponent, type MonteCarloInput } from '../../shared/uncertainty'
import { ENGINE_VERSION } from '../../shared/engine'

/** One benchmark line. */
export interface BenchResult {
  name: string
  /** Time per operation, seconds. */
  seconds: number
  /** Target, seconds per operation, when one is set. */
  targetSeconds?: number
  /** Reference time per operation, seconds (Simpson/bisection), when measured. */
  referenceSeconds?: number
  /** Largest relative difference engine vs reference over the benchmark inputs. */
  referenceDifference?: number
}

// --- reference implementation (plain formulas, no shared code) ---------------------------------
const H = 6.62607015e-34
const C = 299792458
const K = 1.380649e-23
const C1L = 2 * H * C * C
const C2 = (H * C) / K
function planckUm(lUm: number, T: number): number {
  const lm = lUm * 1e-6
  return (C1L / lm ** 5 / Math.expm1(C2 / (lm * T))) * 1e-6
}
function simpsonSignal(r: (l: number) => number, a: number, b: number, T: number, panels = 2000): number {
  const h = (b - a) / panels
  let s = r(a) * planckUm(a, T) + r(b) * planckUm(b, T)
  for (let i = 1; i < panels; i++) {
    const l = a + i * h
    s += (i % 2 ? 4 : 2) * r(l) * planckUm(l, T)
  }
  return (s * h) / 3
}
function bisectT(sig: (T: number) => number, target: number): number {
  let lo = 50
  let hi = 5000
  for (let i = 0; i < 60; i++) {
    const m = Math.sqrt(lo * hi)
    if (sig(m) < target) lo = m
    else hi = m
  }
  return Math.sqrt(lo * hi)
}

function time(fn: (i: number) => number, minSeconds: number): number {
  let sink = 0
  for (let i = 0; i < 200; i++) sink += fn(i) // warm-up
  let n = 0
  const t0 = performance.now()
  let t = t0
  while (t - t0 < minSeconds * 1000) {
    for (let i = 0; i < 100; i++) sink += fn(n + i)
    n += 100
    t = performance.now()
  }
  if (sink === 1.2345) console.log('')
  return (t - t0) / 1000 / n
}

function fmt(s: number): string {
  if (s < 1e-6) return `${(s * 1e9).toFixed(0)} ns`
  if (s < 1e-3) return `${(s * 1e6).toFixed(2)} µs`
  if (s < 1) return `${(s * 1e3).toFixed(1)} ms`
  return `${s.toFixed(2)} s`
}

/**
 * Runs the engine benchmark and returns its lines (also printed unless `print` is false).
 * @param options - quick: shorter loops and 10⁵ Monte Carlo trials; print: write the table to stdout
 * @returns one line per operation
 */
export function runEngineBench(options: { quick?: boolean; print?: boolean } = {}): BenchResult[] {
  const quick = options.quick ?? false
  const dur = quick ? 0.2 : 1
  const out: BenchResult[] = []
  const rect: Band = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }
  const tabPoints: [number, number][] = [[7.5, 0], [8, 0.4], [9, 0.95], [11, 1], [13, 0.9], [14, 0.3], [14.5, 0]]
  const tab = prepareBand({ kind: 'tabulated', points: tabPoints })
  // reference for the table: Simpson per linear segment (the responsivity has kinks at the points),
  // 2000 panels in all
  const tabRef = (T: number): number => {
    let s = 0
    const span = tabPoints[tabPoints.length - 1]![0] - tabPoints[0]![0]
    for (let i = 0; i < tabPoints.length - 1; i++) {
      const [a, ra] = tabPoints[i]!
      const [b, rb] = tabPoints[i + 1]!
      const panels = 2 * Math.max(1, Math.round((1000 * (b - a)) / span))
      s += simpsonSignal((l) => ra + ((rb - ra) * (l - a)) / (b - a), a, b, T, panels)
    }
    return s
  }
  const Ts = (i: number): number => 250 + (i % 997) * 0.5

  // rectangular band radiance
  {
    let diff = 0
    for (let i = 0; i < 50; i++) diff = Math.max(diff, Math.abs(bandRadiance(rect, Ts(i * 19)) / simpsonSignal(() => 1, 8, 14, Ts(i * 19)) - 1))
    out.push({
      name: 'rectangular band radiance (8–14 µm)',
      seconds: time((i) => bandRadiance(rect, Ts(i)), dur),
      targetSeconds: 300e-9,
      referenceSeconds: time((i) => simpsonSignal(() => 1, 8, 14, Ts(i)), dur / 4),
      referenceDifference: diff,
    })
  }
  // tabulated band radiance
  {
    let diff = 0
    for (let i = 0; i < 50; i++) diff = Math.max(diff, Math.abs(bandRadiance(tab, Ts(i * 19)) / tabRef(Ts(i * 19)) - 1))
    out.push({
      name: 'tabulated band radiance (7 points, prepared)',
      seconds: time((i) => bandRadiance(tab, Ts(i)), dur),
      referenceSeconds: time((i) => tabRef(Ts(i)), dur / 4),
      referenceDifference: diff,
    })
  }
  // inversion
  {
    const S = (i: number): number => 20 + (i % 991) * 0.3
    let diff = 0
    for (let i = 0; i < 10; i++) {
      const t = temperatureFromRadiance(rect, S(i * 97))
      diff = Math.max(diff, Math.abs(t / bisectT((T) => simpsonSignal(() => 1, 8, 14, T), S(i * 97)) - 1))
    }
    out.push({
      name: 'temperature from radiance (8–14 µm)',
      seconds: time((i) => temperatureFromRadiance(rect, S(i)), dur),
      referenceSeconds: time((i) => bisectT((T) => simpsonSignal(() => 1, 8, 14, T), S(i)), dur / 4),
      referenceDifference: diff,
    })
  }
  // expected reading
  {
    const input = (i: number): ReadingInput => ({
      band: rect,
      sourceTemperatureK: 373.15 + (i % 101) * 0.01,
      sourceEmissivity: 0.95,
      reflectedTemperatureK: 296.15,
      instrumentTemperatureK: 297.15,
      emissivitySetting: 1,
    })
    const refReading = (i: number): number => {
      const p = input(i)
      const sig = (T: number): number => simpsonSignal(() => 1, 8, 14, T)
      const target = (p.sourceEmissivity * sig(p.sourceTemperatureK) + (1 - p.sourceEmissivity) * sig(p.reflectedTemperatureK)) / p.emissivitySetting
      return bisectT(sig, target)
    }
    let diff = 0
    for (let i = 0; i < 5; i++) diff = Math.max(diff, Math.abs(expectedReadingK(input(i * 13)) / refReading(i * 13) - 1))
    out.push({
      name: 'expected reading (8–14 µm)',
      seconds: time((i) => expectedReadingK(input(i)), dur),
      targetSeconds: 5e-6,
      referenceSeconds: time(refReading, dur / 4),
      referenceDifference: diff,
    })
  }
  // 12-component budget
  {
    const dists = ['normal', 'rectangular', 'triangular', 'u-shaped'] as const
    const comps: BudgetComponent[] = Array.from({ length: 12 }, (_, j) => ({
      name: `component ${j + 1}`,
      distribution: dists[j % 4],
      halfWidth: 0.05 * (j + 1),
      ...(j % 4 === 0 ? { coverageFactor: 2 } : {}),
      sensitivity: 1 + j / 10,
      dof: j % 3 === 0 ? undefined : 8 + j,
    }))
    out.push({ name: 'uncertainty budget (12 components)', seconds: time(() => evaluateBudget(comps).expandedUncertainty, dur) })
  }
  // Monte Carlo
  {
    const trials = quick ? 100_000 : 1_000_000
    const inputs: MonteCarloInput[] = [
      { name: 'T_s', distribution: 'normal', value: 373.15, standardUncertainty: 0.025 },
      { name: 'ε_s', distribution: 'rectangular', value: 0.95, halfWidth: 0.01 },
      { name: 'T_w', distribution: 'rectangular', value: 296.15, halfWidth: 1 },
      { name: 'T_d', distribution: 'rectangular', value: 296.15, halfWidth: 1 },
      { name: 'ε_i', distribution: 'constant', value: 0.95 },
    ]
    const model = readingModel(rect)
    runMonteCarlo(model, inputs, { trials: 20_000, seed: 1 }) // warm-up
    const t0 = performance.now()
    runMonteCarlo(model, inputs, { trials, seed: 1 })
    const s = (performance.now() - t0) / 1000
    out.push({ name: `Monte Carlo, reading model, ${trials.toLocaleString('en')} trials (per run)`, seconds: s, ...(quick ? {} : { targetSeconds: 2 }) })
  }

  if (options.print ?? true) {
    console.log(`Bandlight engine ${ENGINE_VERSION} benchmark — node ${process.version}, ${quick ? 'quick' : 'full'} run`)
    console.log('reference = composite Simpson, 2000 panels, on the plain Planck formula (bisection for inversions)\n')
    const rows = out.map((r) => [
      r.name,
      fmt(r.seconds),
      r.targetSeconds !== undefined ? `≤ ${fmt(r.targetSeconds)} ${r.seconds <= r.targetSeconds ? 'met' : 'MISSED'}` : '—',
      r.referenceSeconds !== undefined ? `${fmt(r.referenceSeconds)} (×${(r.referenceSeconds / r.seconds).toFixed(0)})` : '—',
      r.referenceDifference !== undefined ? r.referenceDifference.toExponential(1) : '—',
    ])
    const head = ['operation', 'time/op', 'target', 'reference (speed-up)', 'rel. diff. to ref.']
    const w = head.map((h, j) => Math.max(h.length, ...rows.map((r) => r[j]!.length)))
    const line = (r: string[]): string => r.map((c, j) => c.padEnd(w[j]!)).join('  ')
    console.log(line(head))
    console.log(w.map((n) => '-'.repeat(n)).join('  '))
    for (const r of rows) console.log(line(r))
  }
  return out
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  runEngineBench({ quick: process.argv.includes('--quick') })
}
