/** Helpers shared by the demo, the test runner and the benchmarks: build freshness, ports, the built server. */
import { spawn, type ChildProcess } from 'node:child_process'
import fs from 'node:fs'
import net from 'node:net'
import path from 'node:path'

export const ROOT = path.resolve(import.meta.dirname, '../..')
/** The built server; BANDLIGHT_SERVER_ENTRY points elsewhere (e.g. a copy of .output). */
export const SERVER_ENTRY = process.env.BANDLIGHT_SERVER_ENTRY ? path.resolve(process.env.BANDLIGHT_SERVER_ENTRY) : path.join(ROOT, '.output/server/index.mjs')

const SOURCES = ['app.vue', 'error.vue', 'nuxt.config.ts', 'tailwind.config.ts', 'package.json', 'pages', 'layouts', 'components', 'composables', 'middleware', 'stores', 'assets', 'public', 'server', 'shared']

function newestMtime(p: string): number {
  if (!fs.existsSync(p)) return 0
  const st = fs.statSync(p)
  if (!st.isDirectory()) return st.mtimeMs
  let newest = st.mtimeMs
  for (const entry of fs.readdirSync(p)) newest = Math.max(newest, newestMtime(path.join(p, entry)))
  return newest
}

/** True when .output is missing or older than any source file. */
export function buildIsStale(): boolean {
  if (!fs.existsSync(SERVER_ENTRY)) return true
  const built = fs.statSync(SERVER_ENTRY).mtimeMs
  return SOURCES.some(s => newestMtime(path.join(ROOT, s)) > built)
}

/** Run a command (in `cwd`, default the checkout) and resolve with its exit code. */
export function run(cmd: string, args: string[], env: NodeJS.ProcessEnv = process.env, cwd: string = ROOT): Promise<number> {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { cwd, env, stdio: 'inherit' })
    child.on('exit', code => resolve(code ?? 1))
  })
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer()
    srv.unref()
    srv.on('error', reject)
    srv.listen(0, '127.0.0.1', () => {
      const port = (srv.address() as net.AddressInfo).port
      srv.close(() => resolve(port))
    })
  })
}

/**
 * Start the built server and wait until /api/health answers ok. `entry` and `cwd` start another
 * build (the benchmark's baseline, scripts/bench/baseline.ts); by default this checkout's.
 */
export async function startServer(env: NodeJS.ProcessEnv, port: number, opts: { quiet?: boolean, entry?: string, cwd?: string } = {}): Promise<ChildProcess> {
  const child = spawn(process.execPath, [opts.entry ?? SERVER_ENTRY], {
    cwd: opts.cwd ?? ROOT,
    env: { ...env, PORT: String(port), NODE_ENV: 'production' },
    stdio: opts.quiet ? ['ignore', 'ignore', 'inherit'] : 'inherit',
  })
  const deadline = Date.now() + 60_000
  let exited = false
  child.on('exit', () => (exited = true))
  while (Date.now() < deadline) {
    if (exited) throw new Error('the server exited during start-up')
    try {
      const res = await fetch(`http://127.0.0.1:${port}/api/health`)
      if (res.ok) return child
    }
    catch {
      // not listening yet
    }
    await new Promise(r => setTimeout(r, 250))
  }
  child.kill()
  throw new Error('the server did not answer /api/health within 60 s')
}
