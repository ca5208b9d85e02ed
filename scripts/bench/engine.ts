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
 *
 * Then three sections:
 * - band radiance per bench band (the demo instruments' bands over their ranges): ns per evaluation in
 *   a monomorphic loop (one band object, the call inlined) and in mixed use (the band given as a
 *   plain object, a JSON-parsed object with its keys in another order and a PreparedBand, with the
 *   default constants and 'ITS-90', interleaved), against the previous implementation (the same
 *   checks, then the Widger–Woodall/Bernoulli series summed per call: `rectangularRadianceSeries`);
 * - the same bands against scipy.integrate.quad (epsrel 1e-10), when `python3 -c 'import scipy'` works
 *   (scripts/bench/scipy_band_radiance.py): time per quad call, ours, ratio, largest disagreement;
 * - Monte Carlo of the reading model with the demo's 33-point tabulated responsivity through a
 *   SignalTable (as the worker runs it: range 50–5000 K, built lazily inside the timed run) against
 *   a rectangular 8–14 µm band, and the exact per-trial evaluation timed on fewer trials.
 * The machine's load average is printed with the figures.
 */
import { spawnSync } from 'node:child_process'
import { availableParallelism, loadavg } from 'node:os'
import { fileURLToPath, pathToFileURL } from 'node:url'
import {
  bandRadiance,
  CODATA_2018,
  expectedReadingK,
  INVERSION_RANGE_K,
  prepareBand,
  prepareSignalTable,
  readingModel,
  requireTemperature,
  resolveConstants,
  temperatureFromRadiance,
  validateBand,
  type Band,
  type PreparedBand,
  type RadiationConstantsChoice,
  type ReadingInput,
  type SignalTable,
  type TabulatedBand,
} from '#shared/radiometry'
import { rectangularRadianceSeries } from '#shared/radiometry/planck'
import { normalizeResponsivity } from '#shared/registers/responsivity'
import { evaluateBudget, runMonteCarlo, runMonteCarloChunk, Xoshiro128, type BudgetComponent, type MonteCarloInput } from '#shared/uncertainty'
import { ENGINE_VERSION } from '#shared/engine'

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

// --- band radiance per bench band, previous implementation, scipy, tabulated Monte Carlo -------

/** The demo instrument models' bands and ranges (scripts/demo-data/registers.ts), K. */
const BENCH_BANDS = [
  { name: '8–14 µm', l1: 8, l2: 14, minK: 243.15, maxK: 823.15 },
  { name: '3.8–4.0 µm', l1: 3.8, l2: 4.0, minK: 573.15, maxK: 1573.15 },
  { name: '2.0–2.4 µm', l1: 2.0, l2: 2.4, minK: 523.15, maxK: 1273.15 },
  { name: '1.5–1.7 µm', l1: 1.5, l2: 1.7, minK: 573.15, maxK: 1873.15 },
  { name: '0.95–1.05 µm', l1: 0.95, l2: 1.05, minK: 973.15, maxK: 2273.15 },
  { name: '0.64–0.66 µm', l1: 0.64, l2: 0.66, minK: 973.15, maxK: 2773.15 },
] as const

/** Target for band radiance, s per evaluation. */
const BAND_TARGET = 56e-9

/**
 * The previous implementation's path for a rectangular band, for comparison only: the same input
 * checks as before, then the Widger–Woodall/Bernoulli series summed at every call.
 */
function previousBandRadiance(band: Band | PreparedBand, T: number, constants?: RadiationConstantsChoice): number {
  validateBand(band)
  requireTemperature(T, 'temperatureK')
  const c = resolveConstants(constants)
  if (band.kind !== 'rectangular') throw new Error('rectangular bands only')
  return rectangularRadianceSeries(band.lambda1Um, band.lambda2Um, T, c)
}

// One loop per implementation and use, so each call site keeps its own type feedback.
function monoNew(band: Band, temps: Float64Array, reps: number): number {
  let s = 0
  for (let r = 0; r < reps; r++) for (let i = 0; i < temps.length; i++) s += bandRadiance(band, temps[i]!)
  return s
}
function monoPrevious(band: Band, temps: Float64Array, reps: number): number {
  let s = 0
  for (let r = 0; r < reps; r++) for (let i = 0; i < temps.length; i++) s += previousBandRadiance(band, temps[i]!)
  return s
}
function tableLoop(t: SignalTable, temps: Float64Array, reps: number): number {
  let s = 0
  for (let r = 0; r < reps; r++) for (let i = 0; i < temps.length; i++) s += t.signal(temps[i]!)
  return s
}
function exactTabLoop(band: PreparedBand, temps: Float64Array, reps: number): number {
  let s = 0
  for (let r = 0; r < reps; r++) for (let i = 0; i < temps.length; i++) s += bandRadiance(band, temps[i]!)
  return s
}
interface MixedCalls {
  bands: (Band | PreparedBand)[]
  constants: (RadiationConstantsChoice | undefined)[]
  temps: Float64Array
}
function mixedNew(m: MixedCalls, reps: number): number {
  let s = 0
  const { bands, constants, temps } = m
  for (let r = 0; r < reps; r++) for (let i = 0; i < temps.length; i++) s += bandRadiance(bands[i]!, temps[i]!, constants[i])
  return s
}
function mixedPrevious(m: MixedCalls, reps: number): number {
  let s = 0
  const { bands, constants, temps } = m
  for (let r = 0; r < reps; r++) for (let i = 0; i < temps.length; i++) s += previousBandRadiance(bands[i]!, temps[i]!, constants[i])
  return s
}

/**
 * Seconds per evaluation of run(reps), which makes reps × evalsPerRep evaluations: warm-up (so the
 * loop is optimised), then the median of three timings of about minSeconds/3 each.
 */
function timeLoop(run: (reps: number) => number, evalsPerRep: number, minSeconds: number): number {
  let sink = 0
  let reps = 1
  let t = 0
  const part = minSeconds / 3
  // warm-up, and find reps for one part
  for (let w = performance.now(); performance.now() - w < 1000 * Math.max(0.03, part); ) sink += run(1)
  for (;;) {
    const t0 = performance.now()
    sink += run(reps)
    t = (performance.now() - t0) / 1000
    if (t >= part || reps >= 1 << 24) break
    reps = t > 0 ? Math.max(reps * 2, Math.ceil((reps * part * 1.1) / t)) : reps * 8
  }
  const times = [t]
  for (let k = 0; k < 2; k++) {
    const t0 = performance.now()
    sink += run(reps)
    times.push((performance.now() - t0) / 1000)
  }
  if (sink === 1.2345) console.log('')
  times.sort((a, b) => a - b)
  return times[1]! / (reps * evalsPerRep)
}

/** The demo's invented thermopile responsivity (same formula as scripts/demo-data/registers.ts), normalised as stored. */
function demoThermopile(step: number): TabulatedBand {
  const points: [number, number][] = []
  for (let l = 7.0; l <= 15.0001; l += step) {
    const rise = 1 / (1 + Math.exp(-(l - 8) / 0.18))
    const fall = 1 / (1 + Math.exp((l - 14) / 0.22))
    const slope = 0.82 + (0.18 * (l - 7)) / 8
    points.push([Math.round(l * 100) / 100, Math.round(rise * fall * slope * 10000) / 10000])
  }
  return { kind: 'tabulated', points: normalizeResponsivity(points) }
}

function scipyAvailable(): boolean {
  const r = spawnSync('python3', ['-c', 'import scipy'], { stdio: 'ignore' })
  return r.status === 0
}

function table(head: string[], rows: string[][]): void {
  const w = head.map((h, j) => Math.max(h.length, ...rows.map((r) => r[j]!.length)))
  const line = (r: string[]): string => r.map((c, j) => c.padEnd(w[j]!)).join('  ')
  console.log(line(head))
  console.log(w.map((n) => '-'.repeat(n)).join('  '))
  for (const r of rows) console.log(line(r))
}

const load = (): string => loadavg().map((v) => v.toFixed(2)).join(', ')

/**
 * Band radiance per bench band (monomorphic and mixed use, against the previous implementation),
 * the scipy comparison and the tabulated-band Monte Carlo; prints its sections and returns its lines.
 */
function runBandSections(quick: boolean, print: boolean, mcInputs: MonteCarloInput[], rectMcSeconds: number): BenchResult[] {
  const out: BenchResult[] = []
  const dur = quick ? 0.1 : 0.3
  const N = 4096
  const rng = new Xoshiro128(2024)
  const temps = BENCH_BANDS.map((b) => Float64Array.from({ length: N }, () => b.minK + (b.maxK - b.minK) * rng.nextDouble()))
  const plain = BENCH_BANDS.map((b): Band => ({ kind: 'rectangular', lambda1Um: b.l1, lambda2Um: b.l2 }))
  // the same band as an API body would give it (keys in another order) and prepared
  const variants = BENCH_BANDS.map((b, j): (Band | PreparedBand)[] => [
    plain[j]!,
    JSON.parse(`{"lambda2Um":${b.l2},"lambda1Um":${b.l1},"kind":"rectangular"}`) as Band,
    prepareBand(plain[j]!),
  ])
  const constantsChoices: (RadiationConstantsChoice | undefined)[] = [undefined, 'ITS-90']
  const mixedFor = (bandIdx: number[]): MixedCalls => {
    const m: MixedCalls = { bands: [], constants: [], temps: new Float64Array(N) }
    for (let i = 0; i < N; i++) {
      const j = bandIdx[i % bandIdx.length]!
      const k = Math.floor(i / bandIdx.length)
      m.bands.push(variants[j]![k % 3]!)
      m.constants.push(constantsChoices[Math.floor(k / 3) % 2])
      m.temps[i] = temps[j]![i]!
    }
    return m
  }

  // 1. band radiance per band
  const rows: string[][] = []
  const monoNs: number[] = []
  const all = BENCH_BANDS.map((_, j) => j)
  for (let j = 0; j < BENCH_BANDS.length; j++) {
    const b = BENCH_BANDS[j]!
    const mono = timeLoop((r) => monoNew(plain[j]!, temps[j]!, r), N, dur)
    const monoPrev = timeLoop((r) => monoPrevious(plain[j]!, temps[j]!, r), N, dur)
    const m = mixedFor([j])
    const mixed = timeLoop((r) => mixedNew(m, r), N, dur)
    const mixedPrev = timeLoop((r) => mixedPrevious(m, r), N, dur)
    let diff = 0
    for (let i = 0; i < 256; i++) {
      const T = temps[j]![i]!
      diff = Math.max(diff, Math.abs(bandRadiance(plain[j]!, T) / previousBandRadiance(plain[j]!, T) - 1))
    }
    monoNs.push(mono)
    rows.push([
      b.name,
      `${b.minK}–${b.maxK} K`,
      fmt(mono),
      `${fmt(monoPrev)} (×${(monoPrev / mono).toFixed(2)})`,
      fmt(mixed),
      `${fmt(mixedPrev)} (×${(mixedPrev / mixed).toFixed(2)})`,
      Math.max(mono, mixed) <= BAND_TARGET ? 'met' : 'MISSED',
      diff.toExponential(1),
    ])
    out.push({ name: `band radiance ${b.name}, monomorphic loop`, seconds: mono, targetSeconds: BAND_TARGET, referenceSeconds: monoPrev, referenceDifference: diff })
    out.push({ name: `band radiance ${b.name}, mixed use`, seconds: mixed, targetSeconds: BAND_TARGET, referenceSeconds: mixedPrev })
  }
  const mAll = mixedFor(all)
  const mixedAll = timeLoop((r) => mixedNew(mAll, r), N, dur)
  const mixedAllPrev = timeLoop((r) => mixedPrevious(mAll, r), N, dur)
  rows.push(['all six interleaved', '', '', '', fmt(mixedAll), `${fmt(mixedAllPrev)} (×${(mixedAllPrev / mixedAll).toFixed(2)})`, mixedAll <= BAND_TARGET ? 'met' : 'MISSED', ''])
  out.push({ name: 'band radiance, six bands interleaved, mixed use', seconds: mixedAll, targetSeconds: BAND_TARGET, referenceSeconds: mixedAllPrev })
  {
    // the benchmark's 7-point tabulated band: a SignalTable over 250–750 K against the exact closed form
    const tab = prepareBand({ kind: 'tabulated', points: [[7.5, 0], [8, 0.4], [9, 0.95], [11, 1], [13, 0.9], [14, 0.3], [14.5, 0]] })
    const tt = Float64Array.from({ length: N }, () => 250 + 500 * rng.nextDouble())
    const st = prepareSignalTable(tab, 250, 750).buildAll()
    const viaTable = timeLoop((r) => tableLoop(st, tt, r), N, dur)
    const exact = timeLoop((r) => exactTabLoop(tab, tt, r), N, dur)
    let diff = 0
    for (let i = 0; i < 512; i++) diff = Math.max(diff, Math.abs(st.signal(tt[i]!) / bandRadiance(tab, tt[i]!) - 1))
    rows.push(['7-point table via SignalTable', '250–750 K', fmt(viaTable), `${fmt(exact)} exact (×${(exact / viaTable).toFixed(0)})`, '—', '—', viaTable <= BAND_TARGET ? 'met' : 'MISSED', `${diff.toExponential(1)} (to exact)`])
    out.push({ name: 'tabulated band radiance (7 points) via SignalTable', seconds: viaTable, targetSeconds: BAND_TARGET, referenceSeconds: exact, referenceDifference: diff })
  }
  if (print) {
    console.log(`\nBand radiance per bench band, ns per evaluation (target ≤ ${fmt(BAND_TARGET)}); previous = same checks + series per call; load ${load()}`)
    table(['band', 'temperatures', 'mono', 'mono previous', 'mixed', 'mixed previous', 'target', 'rel. diff. to previous'], rows)
  }

  // 2. scipy
  if (!scipyAvailable()) {
    if (print) console.log('\nscipy comparison skipped: `python3 -c "import scipy"` failed')
  } else {
    const perBand = 24
    const groups = BENCH_BANDS.map((b, j) => ({ name: b.name, cases: Array.from(temps[j]!.subarray(0, perBand), (T) => [b.l1, b.l2, T]) }))
    const req = { c1LUm: CODATA_2018.c1LUm, c2UmK: CODATA_2018.c2UmK, epsrel: 1e-10, minSeconds: quick ? 0.1 : 0.4, groups }
    const script = fileURLToPath(new URL('./scipy_band_radiance.py', import.meta.url))
    const r = spawnSync('python3', [script], { input: JSON.stringify(req), encoding: 'utf8', maxBuffer: 1 << 24 })
    if (r.status !== 0) {
      if (print) console.log(`\nscipy comparison skipped: ${r.stderr.trim().split('\n').pop()}`)
    } else {
      const res = JSON.parse(r.stdout) as { scipy: string; groups: { name: string; secondsPerCall: number; values: number[] }[] }
      const srows = res.groups.map((g, j) => {
        let diff = 0
        g.values.forEach((v, i) => {
          diff = Math.max(diff, Math.abs(bandRadiance(plain[j]!, temps[j]![i]!) / v - 1))
        })
        out.push({ name: `band radiance ${g.name} vs scipy quad`, seconds: monoNs[j]!, referenceSeconds: g.secondsPerCall, referenceDifference: diff })
        return [g.name, fmt(g.secondsPerCall), fmt(monoNs[j]!), `×${(g.secondsPerCall / monoNs[j]!).toFixed(0)}`, diff.toExponential(1)]
      })
      if (print) {
        console.log(`\nscipy ${res.scipy} integrate.quad (epsabs=0, epsrel=1e-10), ${perBand} temperatures per band, same run; ours = monomorphic figure above`)
        table(['band', 'quad per call', 'ours per eval', 'ours faster', 'max rel. disagreement'], srows)
      }
    }
  }

  // 3. Monte Carlo with the demo's tabulated responsivity
  const trials = quick ? 100_000 : 1_000_000
  const exactTrials = quick ? 2_000 : 20_000
  const mrows: string[][] = [['rectangular 8–14 µm', fmt(rectMcSeconds), '×1.00', '', '']]
  for (const [name, band] of [['demo table, 33 points', demoThermopile(0.25)], ['121 points (same curve, 1/15 µm)', demoThermopile(1 / 15)]] as const) {
    const range = { temperatureRangeK: INVERSION_RANGE_K }
    runMonteCarlo(readingModel(band, undefined, range), mcInputs, { trials: 20_000, seed: 1 }) // warm-up (its own table)
    const t0 = performance.now()
    runMonteCarlo(readingModel(band, undefined, range), mcInputs, { trials, seed: 1 }) // fresh table, built inside the run
    const s = (performance.now() - t0) / 1000
    const exactModel = readingModel(band)
    const e0 = performance.now()
    const exactValues = runMonteCarloChunk(exactModel, mcInputs, 1, 0, exactTrials)
    const exactPerRun = (((performance.now() - e0) / 1000) * trials) / exactTrials
    const tableValues = runMonteCarloChunk(readingModel(band, undefined, range), mcInputs, 1, 0, exactTrials)
    let diff = 0
    for (let i = 0; i < exactTrials; i++) diff = Math.max(diff, Math.abs(tableValues[i]! - exactValues[i]!))
    const ratio = s / rectMcSeconds
    mrows.push([
      `${name}, SignalTable`,
      fmt(s),
      `×${ratio.toFixed(2)} ${ratio <= 2 ? '(≤ 2× met)' : '(≤ 2× MISSED)'}`,
      `${fmt(exactPerRun)} (×${(exactPerRun / s).toFixed(0)})`,
      `${diff.toExponential(1)} K`,
    ])
    out.push({ name: `Monte Carlo, reading model, ${name}, ${trials.toLocaleString('en')} trials (SignalTable)`, seconds: s, targetSeconds: 2 * rectMcSeconds, referenceSeconds: exactPerRun })
  }
  if (print) {
    console.log(`\nMonte Carlo, reading model, ${trials.toLocaleString('en')} trials per run (inputs as above); exact = per-trial closed form, timed on ${exactTrials.toLocaleString('en')} trials and scaled; load ${load()}`)
    table(['band', 'time per run', 'vs rectangular', 'exact per trial (table faster)', `max |table − exact| (${exactTrials.toLocaleString('en')} trials)`], mrows)
  }
  return out
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
  let mcInputs: MonteCarloInput[] = []
  let rectMcSeconds = Number.NaN
  const loadBefore = load()

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
    mcInputs = inputs
    rectMcSeconds = s
  }

  const print = options.print ?? true
  if (print) {
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
    console.log(`load average (1, 5, 15 min): ${loadBefore} before, ${load()} after; ${availableParallelism()} cores`)
  }
  return out.concat(runBandSections(quick, print, mcInputs, rectMcSeconds))
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  runEngineBench({ quick: process.argv.includes('--quick') })
}
