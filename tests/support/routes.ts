/**
 * Enumerates the API from the files in server/api, so a new route is covered by the
 * access tests without anyone listing it. Each file `a/[id]/b.post.ts` becomes
 * `{ method: 'POST', path: '/api/a/1/b', roles }`, where `roles` are read from the
 * handler's `requireRole(event, ...)` call (empty = any signed-in user).
 */
import fs from 'node:fs'
import path from 'node:path'
import { LAB_ROLES, type Role } from '../../shared/roles'

export interface ApiRoute {
  file: string
  method: string
  path: string
  roles: Role[]
  /** true when the handler calls requireRole at all. */
  checksRole: boolean
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
    const urlPath = '/api/' + segments.map(s => (/^\[.*\]$/.test(s) ? '1' : s)).join('/')
    const src = fs.readFileSync(file, 'utf8')
    const call = /requireRole\(event(?:,\s*([^)]*))?\)/.exec(src)
    const args = call?.[1] ?? ''
    const roles = [...args.matchAll(/'(\w+)'/g)].map(x => x[1] as Role)
    if (args.includes('LAB_ROLES')) roles.push(...LAB_ROLES)
    return { file: rel, method, path: urlPath.replace(/\/$/, ''), roles, checksRole: !!call }
  })
}
