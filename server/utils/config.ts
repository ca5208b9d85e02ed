/**
 * The configuration of a Bandlight server: the one module that reads the environment.
 *
 * Every setting has a documented variable (README, "Configuration") and a default. A setting may be
 * given by its plain name (`DATABASE_URL`) or with Nuxt's runtime-config prefix (`NUXT_DATABASE_URL`);
 * the prefixed name wins when both are set. Values are read once, on first use, and are then fixed
 * for the life of the process (`resetConfig()` re-reads them, for tests and scripts).
 *
 * This module imports nothing from Nuxt or Nitro: scripts (migrate, seed, demo, bench) use it too.
 */

export const DEFAULT_DATABASE_URL = 'sqlite:./data/bandlight.sqlite'
export const DEFAULT_UPLOAD_MAX_BYTES = 10 * 1024 * 1024
export const DEFAULT_SMTP_URL = 'smtp://127.0.0.1:2525'
export const DEFAULT_MAIL_FROM = 'Bandlight <calibration@bandlight.test>'
export const DEFAULT_PUBLIC_BASE_URL = 'http://localhost:3000'

export interface BandlightConfig {
  /** `sqlite:…` or `postgres://…` (DATABASE_URL). */
  databaseUrl: string
  /** Log every SQL statement (DB_LOG=1). */
  databaseLog: boolean
  /** Most connections one instance opens to PostgreSQL (DB_POOL_MAX). */
  databasePoolMax: number
  /** SQLite only: the page cache of each connection, MiB (SQLITE_CACHE_MB). */
  sqliteCacheMb: number
  /**
   * Where stored files (uploads, certificate PDFs) live (FILE_STORAGE): `directory` (under
   * {@link dataDir}) or `database` (table `file_contents`); null = `directory` on SQLite,
   * `database` on PostgreSQL.
   */
  fileStorage: 'directory' | 'database' | null
  /** Where stored files live (BANDLIGHT_DATA_DIR); null = `files/` beside the SQLite file (`data/files` on PostgreSQL). */
  dataDir: string | null
  /** Largest accepted upload, bytes (UPLOAD_MAX_BYTES). */
  uploadMaxBytes: number
  /** Largest JSON (or other non-file) request body, bytes (BODY_MAX_BYTES). */
  bodyMaxBytes: number
  /** Take the client address from X-Forwarded-For and the host from X-Forwarded-Host/Proto (TRUST_PROXY=1). */
  trustProxy: boolean
  /** Origins besides the server's own from which browsers may send changes (ALLOWED_ORIGINS, comma-separated). */
  allowedOrigins: string[]
  /** The laboratory's public address, no trailing slash (PUBLIC_BASE_URL). */
  publicBaseUrl: string
  /** Sign-in throttling (LOGIN_*). */
  login: {
    /** Failures of one account from one address before that pair waits (LOGIN_MAX_FAILURES). */
    maxFailures: number
    /** Failures of one account from all addresses after which every attempt is slowed (LOGIN_MAX_FAILURES_PER_ACCOUNT). */
    maxFailuresPerAccount: number
    /** Failures for unknown accounts from one address before that address waits (LOGIN_MAX_FAILURES_PER_ADDRESS). */
    maxFailuresPerAddress: number
    /** The counting window, ms (LOGIN_WINDOW_MINUTES). */
    windowMs: number
  }
  /** Public verification throttling (VERIFY_*). */
  verify: { maxPerMinute: number, maxFailures: number, windowMs: number }
  /** Worker threads for Monte Carlo (MC_WORKERS); null = number of cores, at most 4. */
  monteCarloWorkers: number | null
  /** Mail (SMTP_URL, MAIL_FROM, MAIL_SEND_INTERVAL_MS, MAIL_TOKEN_SECRET, BANDLIGHT_MAILBOX_DIR). */
  mail: { smtpUrl: string, from: string, sendIntervalMs: number, tokenSecret: string | null, mailboxDir: string | null }
  /** The session secret (NUXT_SESSION_PASSWORD), read by nuxt-auth-utils too. */
  sessionPassword: string | null
  /** Laboratory identity used in mail before lab settings exist (LAB_NAME, LAB_ADDRESS). */
  lab: { name: string | null, address: string | null }
  /**
   * Card payment through the hosted checkout (STRIPE_SECRET_KEY, STRIPE_WEBHOOK_SECRET,
   * STRIPE_API_BASE): without a secret key card payment is off; the API base points the SDK at
   * another server (the local fake of demo, development and tests), null = the provider's own.
   */
  payments: { secretKey: string | null, webhookSecret: string | null, apiBase: string | null }
}

function raw(name: string): string | undefined {
  const v = process.env[`NUXT_${name}`] ?? process.env[name]
  return v === undefined || v === '' ? undefined : v
}

function positive(name: string, fallback: number): number {
  const v = Number(raw(name))
  return Number.isFinite(v) && v > 0 ? v : fallback
}

function nonNegative(name: string, fallback: number): number {
  const s = raw(name)
  if (s === undefined) return fallback
  const v = Number(s)
  return Number.isFinite(v) && v >= 0 ? v : fallback
}

function fileStorage(v: string | undefined): BandlightConfig['fileStorage'] {
  if (v === undefined) return null
  if (v === 'directory' || v === 'database') return v
  throw new Error(`FILE_STORAGE must be "directory" or "database" (got "${v}")`)
}

function paymentApiBase(v: string | undefined): string | null {
  if (v === undefined) return null
  let url: URL
  try {
    url = new URL(v)
  }
  catch {
    throw new Error(`STRIPE_API_BASE must be an address such as http://127.0.0.1:12111 (got "${v}")`)
  }
  if (url.protocol !== 'http:' && url.protocol !== 'https:') throw new Error(`STRIPE_API_BASE must start with http:// or https:// (got "${v}")`)
  return url.origin
}

function read(): BandlightConfig {
  const workers = Number(raw('MC_WORKERS'))
  return {
    databaseUrl: raw('DATABASE_URL') ?? DEFAULT_DATABASE_URL,
    databaseLog: raw('DB_LOG') === '1',
    databasePoolMax: Math.floor(positive('DB_POOL_MAX', 10)),
    sqliteCacheMb: Math.floor(positive('SQLITE_CACHE_MB', 64)),
    fileStorage: fileStorage(raw('FILE_STORAGE')),
    dataDir: raw('BANDLIGHT_DATA_DIR') ?? null,
    uploadMaxBytes: Math.floor(positive('UPLOAD_MAX_BYTES', DEFAULT_UPLOAD_MAX_BYTES)),
    bodyMaxBytes: Math.floor(positive('BODY_MAX_BYTES', 1024 * 1024)),
    trustProxy: raw('TRUST_PROXY') === '1',
    allowedOrigins: (raw('ALLOWED_ORIGINS') ?? '').split(',').map(s => s.trim().replace(/\/+$/, '')).filter(Boolean),
    publicBaseUrl: (raw('PUBLIC_BASE_URL') ?? DEFAULT_PUBLIC_BASE_URL).replace(/\/+$/, ''),
    login: {
      maxFailures: positive('LOGIN_MAX_FAILURES', 5),
      maxFailuresPerAccount: positive('LOGIN_MAX_FAILURES_PER_ACCOUNT', 20),
      maxFailuresPerAddress: positive('LOGIN_MAX_FAILURES_PER_ADDRESS', 100),
      windowMs: positive('LOGIN_WINDOW_MINUTES', 15) * 60_000,
    },
    verify: {
      maxPerMinute: positive('VERIFY_MAX_PER_MINUTE', 60),
      maxFailures: positive('VERIFY_MAX_FAILURES', 20),
      windowMs: positive('VERIFY_WINDOW_MINUTES', 15) * 60_000,
    },
    monteCarloWorkers: Number.isFinite(workers) && workers > 0 ? Math.floor(workers) : null,
    mail: {
      smtpUrl: raw('SMTP_URL') ?? DEFAULT_SMTP_URL,
      from: raw('MAIL_FROM') ?? DEFAULT_MAIL_FROM,
      sendIntervalMs: nonNegative('MAIL_SEND_INTERVAL_MS', 5000),
      tokenSecret: raw('MAIL_TOKEN_SECRET') ?? null,
      mailboxDir: raw('BANDLIGHT_MAILBOX_DIR') ?? null,
    },
    sessionPassword: process.env.NUXT_SESSION_PASSWORD || null,
    lab: { name: raw('LAB_NAME') ?? null, address: raw('LAB_ADDRESS') ?? null },
    payments: { secretKey: raw('STRIPE_SECRET_KEY') ?? null, webhookSecret: raw('STRIPE_WEBHOOK_SECRET') ?? null, apiBase: paymentApiBase(raw('STRIPE_API_BASE')) },
  }
}

let current: BandlightConfig | null = null

/** The server's configuration (read from the environment on first use). */
export function config(): BandlightConfig {
  current ??= read()
  return current
}

/** Forget the configuration read so far; the next `config()` reads the environment again. */
export function resetConfig(): void {
  current = null
}
