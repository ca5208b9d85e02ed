/**
 * The baseline the benchmark measures beside the current tree: a copy of an earlier commit, kept in
 * the system's temporary folder so that figures of both are taken in the same run on the same machine.
 *
 *   node --import tsx scripts/bench/baseline.ts [--base=REV]   # extract REV and build it (one `nuxt build`)
 *   npm run bench -- --base=REV                                # the bench then measures REV beside this tree
 *
 * REV defaults to {@link DEFAULT_BASE_REV}, the commit before issue 17 (speed where people wait). The
 * copy is `git archive REV` unpacked into `<tmp>/bandlight-bench-base/<full sha>/`, with `node_modules`
 * linked to this checkout's, built with its own `.nuxt` and `.output` there. Building takes a while on a
 * busy machine, so the bench never builds it itself: without a built copy it prints the figures that
 * need none (CPU per request against the raw SQL) and says how to make the copy.
 */
import { execFileSync, spawn } from 'node:child_process'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { fileURLToPath } from 'node:url'
import { ROOT } from '../lib/server'

/** The commit before issue 17's changes (main at bef6913). */
export const DEFAULT_BASE_REV = 'bef6913630622f84c5c68ef4d9e20b7c50484253'

export interface BaseTree {
  rev: string
  sha: string
  /** The unpacked source tree (its scripts run there with `node --import tsx`). */
  dir: string
  /** Its built server, or null when not built yet. */
  serverEntry: string | null
}

/** The base revision named on the command line (`--base=REV`), by BANDLIGHT_BENCH_BASE, or the default. */
export function baseRevFromArgs(argv: readonly string[] = process.argv): string {
  return argv.find(a => a.startsWith('--base='))?.slice(7) || process.env.BANDLIGHT_BENCH_BASE || DEFAULT_BASE_REV
}

function resolveSha(rev: string): string | null {
  try {
    return execFileSync('git', ['rev-parse', '--verify', `${rev}^{commit}`], { cwd: ROOT, encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'] }).trim()
  }
  catch {
    return null
  }
}

/** Where the copy of `rev` lives (whether or not it exists yet). */
export function baseDir(sha: string): string {
  return path.join(os.tmpdir(), 'bandlight-bench-base', sha)
}

/** The kept copy of `rev`, or null when it was never unpacked (or the revision is unknown). */
export function findBaseTree(rev: string): BaseTree | null {
  const sha = resolveSha(rev)
  if (!sha) return null
  const dir = baseDir(sha)
  if (!fs.existsSync(path.join(dir, 'package.json'))) return null
  const entry = path.join(dir, '.output/server/index.mjs')
  return { rev, sha, dir, serverEntry: fs.existsSync(entry) ? entry : null }
}

/** Unpack `rev` (if needed) and build it (if needed); returns the tree. */
export async function prepareBaseTree(rev: string): Promise<BaseTree> {
  const sha = resolveSha(rev)
  if (!sha) throw new Error(`unknown revision ${rev}`)
  const dir = baseDir(sha)
  if (!fs.existsSync(path.join(dir, 'package.json'))) {
    fs.mkdirSync(dir, { recursive: true })
    const archive = execFileSync('git', ['archive', '--format=tar', sha], { cwd: ROOT, maxBuffer: 1 << 30 })
    execFileSync('tar', ['-x', '-C', dir], { input: archive })
    fs.symlinkSync(fs.realpathSync(path.join(ROOT, 'node_modules')), path.join(dir, 'node_modules'))
  }
  const entry = path.join(dir, '.output/server/index.mjs')
  if (!fs.existsSync(entry)) {
    const env = { ...process.env, BANDLIGHT_BUILD_DIR: '', BANDLIGHT_OUTPUT_DIR: '' }
    const code = await new Promise<number>((resolve) => {
      const child = spawn(process.execPath, [path.join(dir, 'node_modules/nuxt/bin/nuxt.mjs'), 'build'], { cwd: dir, env, stdio: 'inherit' })
      child.on('exit', c => resolve(c ?? 1))
    })
    if (code !== 0 || !fs.existsSync(entry)) throw new Error(`building ${rev} in ${dir} failed`)
  }
  return { rev, sha, dir, serverEntry: entry }
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const tree = await prepareBaseTree(baseRevFromArgs())
  console.log(`base ${tree.rev} (${tree.sha.slice(0, 10)}) ready in ${tree.dir}`)
}
