/**
 * Enumerates the API from the files in server/api, so a new route is covered by the access tests
 * without anyone listing it here. Each file `a/[id]/b.post.ts` becomes
 * `{ method: 'POST', key: 'POST /api/a/[id]/b', path: '/api/a/1/b' }`. What each route requires is
 * looked up in the route matrix (shared/routeAccess.ts) — never read from the handler's source.
 */
import fs from 'node:fs'
import path from 'node:path'

export interface ApiRoute {
  file: string
  method: string
  /** `METHOD /api/path/[param]`, the key of the route matrix. */
  key: string
  /** A concrete path with every parameter set to 1. */
  path: string
}

const API_DIR = path.resolve(import.meta.dirname, '../../server/api')

function walk(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap(e =>
    e.isDirectory() ? walk(path.join(dir, e.name)) : e.name.endsWith('.ts') ? [path.join(dir, e.name)] : [],
  )
}

export function apiRoutes(): ApiRoute[] {
  return walk(API_DIR).map((file) => {
    const rel = path.relative(API_DIR, file).replace(/\\/g, '/')
    const m = /^(.*?)(?:\.(get|post|patch|put|delete))?\.ts$/.exec(rel)!
    const method = (m[2] ?? 'get').toUpperCase()
    const segments = m[1]!.split('/').filter(s => s !== 'index')
    const pattern = ('/api/' + segments.join('/')).replace(/\/$/, '')
    const urlPath = pattern.split('/').map(s => (/^\[.*\]$/.test(s) ? '1' : s)).join('/')
    return { file: rel, method, key: `${method} ${pattern}`, path: urlPath }
  })
}
