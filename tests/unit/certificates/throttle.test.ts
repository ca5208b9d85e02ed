// Throttle of the public verification (server/utils/certificateThrottle.ts).
import { describe, expect, it } from 'vitest'
import { verifyFailed, verifyThrottle } from '../../../server/utils/certificateThrottle'

describe('verification throttle', () => {
  it('stops an address after 20 failures in 15 minutes, and lets it in again later', () => {
    const t0 = 1_000_000
    for (let i = 0; i < 20; i++) {
      expect(verifyThrottle('10.0.0.1', t0 + i)).toBe(0)
      verifyFailed('10.0.0.1', t0 + i)
    }
    const wait = verifyThrottle('10.0.0.1', t0 + 100)
    expect(wait).toBeGreaterThan(800)
    expect(wait).toBeLessThanOrEqual(900)
    expect(verifyThrottle('10.0.0.2', t0 + 100)).toBe(0)
    expect(verifyThrottle('10.0.0.1', t0 + 15 * 60_000 + 50)).toBe(0)
  })
  it('allows 60 lookups a minute per address', () => {
    const t0 = 5_000_000_000
    for (let i = 0; i < 60; i++) expect(verifyThrottle('10.0.0.3', t0 + i)).toBe(0)
    expect(verifyThrottle('10.0.0.3', t0 + 61)).toBeGreaterThan(0)
    expect(verifyThrottle('10.0.0.3', t0 + 60_001)).toBe(0)
  })
})
