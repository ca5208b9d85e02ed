/**
 * Sign-in throttling: failures are counted per e-mail and per client address in a
 * sliding window; past the limit the caller gets 429 with Retry-After. Kept in the
 * server's memory (a restart clears it); limits are configurable:
 * LOGIN_MAX_FAILURES (per e-mail, default 5), LOGIN_MAX_FAILURES_PER_ADDRESS (default 20),
 * LOGIN_WINDOW_MINUTES (default 15).
 */
const failures = new Map<string, number[]>()

function limits() {
  return {
    perEmail: Number(process.env.LOGIN_MAX_FAILURES) || 5,
    perAddress: Number(process.env.LOGIN_MAX_FAILURES_PER_ADDRESS) || 20,
    windowMs: (Number(process.env.LOGIN_WINDOW_MINUTES) || 15) * 60_000,
  }
}

function recent(key: string, now: number, windowMs: number): number[] {
  const list = (failures.get(key) ?? []).filter(t => now - t < windowMs)
  if (list.length) failures.set(key, list)
  else failures.delete(key)
  return list
}

/** Seconds until the caller may try again, or 0 when not throttled. */
export function throttledFor(email: string, address: string, now = Date.now()): number {
  const { perEmail, perAddress, windowMs } = limits()
  let wait = 0
  for (const [key, max] of [[`e:${email}`, perEmail], [`a:${address}`, perAddress]] as const) {
    const list = recent(key, now, windowMs)
    if (list.length >= max) wait = Math.max(wait, Math.ceil((list[list.length - max]! + windowMs - now) / 1000))
  }
  return wait
}

export function recordFailure(email: string, address: string, now = Date.now()): void {
  for (const key of [`e:${email}`, `a:${address}`]) failures.set(key, [...(failures.get(key) ?? []), now])
  if (failures.size > 50_000) failures.clear() // bound memory under a flood
}

export function clearFailures(email: string): void {
  failures.delete(`e:${email}`)
}
