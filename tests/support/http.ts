/**
 * A small HTTP client for the API tests: keeps the session cookie like a browser
 * would, and returns status, headers and parsed JSON.
 */
import type { Role } from '../../shared/roles'

export const BASE_URL = process.env.BANDLIGHT_TEST_URL ?? 'http://127.0.0.1:3000'
export const DEMO_PASSWORD = 'bandlight-demo'
export const DEMO_ACCOUNTS: Record<Role, string> = {
  admin: 'admin@bandlight.test',
  technician: 'technician@bandlight.test',
  quality: 'quality@bandlight.test',
  customer: 'customer@bandlight.test',
}

export interface Reply<T = any> { // eslint-disable-line @typescript-eslint/no-explicit-any
  status: number
  headers: Headers
  body: T
}

export class Client {
  private cookies = new Map<string, string>()
  /** `base`: the server this client talks to (another instance in the cluster tests). */
  constructor(private readonly extraHeaders: Record<string, string> = {}, private readonly base: string = BASE_URL) {}

  /** The same session (cookies and headers) against another server instance. */
  at(base: string): Client {
    const c = new Client(this.extraHeaders, base)
    c.cookies = this.cookies
    return c
  }

  async request<T = any>(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<Reply<T>> { // eslint-disable-line @typescript-eslint/no-explicit-any
    const h: Record<string, string> = { accept: 'application/json', ...this.extraHeaders, ...headers }
    if (this.cookies.size) h.cookie = [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ')
    let payload: string | undefined
    if (body !== undefined) {
      payload = typeof body === 'string' ? body : JSON.stringify(body)
      h['content-type'] ??= 'application/json'
    }
    const res = await fetch(this.base + path, { method, headers: h, body: payload, redirect: 'manual' })
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';')
      const i = pair!.indexOf('=')
      const name = pair!.slice(0, i)
      const value = pair!.slice(i + 1)
      if (!value || /Max-Age=0|Expires=Thu, 01 Jan 1970/i.test(c)) this.cookies.delete(name)
      else this.cookies.set(name, value)
    }
    const text = await res.text()
    let parsed: unknown = text
    try {
      parsed = text ? JSON.parse(text) : null
    }
    catch {
      // not JSON
    }
    return { status: res.status, headers: res.headers, body: parsed as T }
  }

  get<T = any>(path: string) { return this.request<T>('GET', path) } // eslint-disable-line @typescript-eslint/no-explicit-any
  post<T = any>(path: string, body?: unknown) { return this.request<T>('POST', path, body ?? {}) } // eslint-disable-line @typescript-eslint/no-explicit-any
  patch<T = any>(path: string, body?: unknown) { return this.request<T>('PATCH', path, body ?? {}) } // eslint-disable-line @typescript-eslint/no-explicit-any

  /** The cookies this client holds, as a Cookie header (to replay an old session in a test). */
  cookieHeader(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ')
  }

  /** A client that sends exactly this Cookie header and keeps whatever the server sets after. */
  static withCookies(header: string, extraHeaders: Record<string, string> = {}): Client {
    const c = new Client(extraHeaders)
    for (const pair of header.split(/;\s*/).filter(Boolean)) {
      const i = pair.indexOf('=')
      c.cookies.set(pair.slice(0, i), pair.slice(i + 1))
    }
    return c
  }

  async login(email: string, password = DEMO_PASSWORD): Promise<Reply> {
    return this.request('POST', '/api/auth/login', { email, password })
  }
}

/** A client signed in as the demo account of a role (throws if sign-in fails); `headers` go with every request. */
export async function signedIn(role: Role, headers: Record<string, string> = {}): Promise<Client> {
  const c = new Client(headers)
  const r = await c.login(DEMO_ACCOUNTS[role])
  if (r.status !== 200) throw new Error(`demo sign-in as ${role} failed: ${r.status} ${JSON.stringify(r.body)}`)
  return c
}

let counter = 0
/** A unique suffix for records made by a test. */
export function unique(prefix = 't'): string {
  counter++
  return `${prefix}${Date.now().toString(36)}${counter}${Math.floor(Math.random() * 1e4)}`
}
