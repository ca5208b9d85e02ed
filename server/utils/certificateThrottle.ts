/**
 * Throttle of the public verification, by client address: at most VERIFY_MAX_PER_MINUTE lookups a
 * minute (default 60) and VERIFY_MAX_FAILURES failed ones in VERIFY_WINDOW_MINUTES (default 20 in
 * 15 min), so verification codes cannot be guessed by trying. Kept in memory like sign-in's.
 */
import { SlidingWindow } from './slidingWindow'

const hits = new SlidingWindow()

function limits() {
  return {
    perMinute: Number(process.env.VERIFY_MAX_PER_MINUTE) || 60,
    failures: Number(process.env.VERIFY_MAX_FAILURES) || 20,
    windowMs: (Number(process.env.VERIFY_WINDOW_MINUTES) || 15) * 60_000,
  }
}

/** Seconds until this address may verify again (0 = now); counts this lookup when allowed. */
export function verifyThrottle(address: string, now = Date.now()): number {
  const { perMinute, failures, windowMs } = limits()
  const wait = hits.waitSeconds(`f:${address}`, failures, windowMs, now) || hits.waitSeconds(`c:${address}`, perMinute, 60_000, now)
  if (wait === 0) hits.add(`c:${address}`, now)
  return wait
}

/** Count a lookup that matched nothing. */
export function verifyFailed(address: string, now = Date.now()): void {
  hits.add(`f:${address}`, now)
}
