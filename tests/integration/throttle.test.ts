// Rate limits counted in the database (server/utils/rateLimit.ts, server/utils/throttle.ts), against
// a temporary database (SQLite, or PostgreSQL under --db=postgres). Time is passed in, so windows are crossed without waiting.
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testDatabaseUrl } from '../support/database'

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-throttle-it-'))
process.env.DATABASE_URL = await testDatabaseUrl(dir, 'throttle')

const { resetConfig } = await import('../../server/utils/config')
resetConfig()
const db = await import('../../server/utils/db')
const { migrate } = await import('../../server/utils/migrate')
const { verifyFailed, verifyThrottle, signInGate, recordSignInFailure, clearSignInFailures } = await import('../../server/utils/throttle')
const { waitSecondsFor, pruneHits, countHits } = await import('../../server/utils/rateLimit')

beforeAll(async () => {
  await migrate()
})
afterAll(async () => {
  await db.closeDatabase()
  fs.rmSync(dir, { recursive: true, force: true })
})

describe('sliding window', () => {
  it('waits until the oldest counted hit leaves the window', () => {
    expect(waitSecondsFor([0, 1000, 2000], 3, 10_000, 2500)).toBe(8) // the hit at 0 leaves at 10 000 ms
    expect(waitSecondsFor([0, 1000], 3, 10_000, 2500)).toBe(0)
    expect(waitSecondsFor([0, 1000, 2000], 3, 10_000, 10_000)).toBe(0)
  })
})

describe('verification throttle', () => {
  it('stops an address after 20 failures in 15 minutes, and lets it in again later', async () => {
    const t0 = 1_000_000
    for (let i = 0; i < 20; i++) {
      expect(await verifyThrottle('10.0.0.1', t0 + i)).toBe(0)
      await verifyFailed('10.0.0.1', t0 + i)
    }
    const wait = await verifyThrottle('10.0.0.1', t0 + 100)
    expect(wait).toBeGreaterThan(800)
    expect(wait).toBeLessThanOrEqual(900)
    expect(await verifyThrottle('10.0.0.2', t0 + 100)).toBe(0)
    expect(await verifyThrottle('10.0.0.1', t0 + 15 * 60_000 + 50)).toBe(0)
  })
  it('allows 60 lookups a minute per address', async () => {
    const t0 = 5_000_000_000
    for (let i = 0; i < 60; i++) expect(await verifyThrottle('10.0.0.3', t0 + i)).toBe(0)
    expect(await verifyThrottle('10.0.0.3', t0 + 61)).toBeGreaterThan(0)
    expect(await verifyThrottle('10.0.0.3', t0 + 60_001)).toBe(0)
  })
})

describe('sign-in throttle', () => {
  const t0 = 9_000_000_000
  it('stops an (account, address) pair after 5 failures, not the same account elsewhere', async () => {
    for (let i = 0; i < 5; i++) {
      expect((await signInGate('a@lab.test', '10.1.0.1', t0 + i)).wait).toBe(0)
      await recordSignInFailure('a@lab.test', '10.1.0.1', true, t0 + i)
    }
    expect((await signInGate('a@lab.test', '10.1.0.1', t0 + 10)).wait).toBeGreaterThan(0)
    expect((await signInGate('a@lab.test', '10.1.0.2', t0 + 10)).wait).toBe(0)
    await clearSignInFailures('a@lab.test', '10.1.0.1')
    expect((await signInGate('a@lab.test', '10.1.0.1', t0 + 11)).wait).toBe(0)
  })
  it('never lets failures on unknown accounts block a known account from the same address', async () => {
    for (let i = 0; i < 150; i++) await recordSignInFailure(`nobody${i}@random.test`, '10.2.0.1', false, t0 + i)
    const gate = await signInGate('known@lab.test', '10.2.0.1', t0 + 200)
    expect(gate.wait).toBe(0)
    expect(gate.delayMs).toBe(0)
    expect(gate.addressOverCeiling).toBe(true)
  })
  it('slows an account under attack from many addresses with a growing delay', async () => {
    for (let i = 0; i < 20; i++) await recordSignInFailure('target@lab.test', `10.3.0.${i}`, true, t0 + i)
    const first = await signInGate('target@lab.test', '10.3.1.1', t0 + 30)
    await recordSignInFailure('target@lab.test', '10.3.1.1', true, t0 + 31)
    const second = await signInGate('target@lab.test', '10.3.1.2', t0 + 32)
    expect(first.wait).toBe(0)
    expect(first.delayMs).toBe(250)
    expect(second.delayMs).toBe(500)
  })
  it('forgets hits older than a day', async () => {
    const later = t0 + 2 * 24 * 3_600_000
    expect(await countHits('login:account:target@lab.test', 10 * 24 * 3_600_000, later)).toBeGreaterThan(0)
    await pruneHits(later)
    expect(await countHits('login:account:target@lab.test', 10 * 24 * 3_600_000, later)).toBe(0)
  })
})
