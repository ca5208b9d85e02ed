/**
 * Sign-in throttling: failures are counted per e-mail and per client address in a
 * sliding window; past the limit the caller gets 429 with Retry-After. Kept in the
 * server's memory (a restart clears it); limits are configurable:
 * LOGIN_MAX_FAILURES (per e-mail, default 5), LOGIN_MAX_FAILURES_PER_ADDRESS (default 20),
 * LOGIN_WINDOW_MINUTES (default 15).
 */
import { SlidingWindow } from './slidingWindow'

const failures = new SlidingWindow()

function limits() {
  return {
    perEmail: Number(process.env.LOGIN_MAX_FAILURES) || 5,
    perAddress: Number(process.env.LOGIN_MAX_FAILURES_PER_ADDRESS) || 20,
    windowMs: (Number(process.env.LOGIN_WINDOW_MINUTES) || 15) * 60_000,
  }
}

/** Seconds until the caller may try again, or 0 when not throttled. */
export function throttledFor(email: string, address: string, now = Date.now()): number {
  const { perEmail, perAddress, windowMs } = limits()
  return Math.max(failures.waitSeconds(`e:${email}`, perEmail, windowMs, now), failures.waitSeconds(`a:${address}`, perAddress, windowMs, now))
}

export function recordFailure(email: string, address: string, now = Date.now()): void {
  failures.add(`e:${email}`, now)
  failures.add(`a:${address}`, now)
}

export function clearFailures(email: string): void {
  failures.forget(`e:${email}`)
}
