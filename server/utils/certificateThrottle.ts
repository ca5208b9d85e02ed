/**
 * Throttle of the public verification, by client address: at most VERIFY_MAX_PER_MINUTE lookups a
 * minute (default 60) and VERIFY_MAX_FAILURES failed ones in VERIFY_WINDOW_MINUTES (default 20 in
 * 15 min), so verification codes cannot be guessed by trying. Kept in memory like sign-in's.
 */
const hits = new Map<string, number[]>()

function limits() {
  return {
    perMinute: Number(process.env.VERIFY_MAX_PER_MINUTE) || 60,
    failures: Number(process.env.VERIFY_MAX_FAILURES) || 20,
    windowMs: (Number(process.env.VERIFY_WINDOW_MINUTES) || 15) * 60_000,
  }
}

function recent(key: string, now: number, windowMs: number): number[] {
  const list = (hits.get(key) ?? []).filter(t => now - t < windowMs)
  if (list.length) hits.set(key, list)
  else hits.delete(key)
  return list
}

/** Seconds until this address may verify again (0 = now); counts this lookup when allowed. */
export function verifyThrottle(address: string, now = Date.now()): number {
  const { perMinute, failures, windowMs } = limits()
  const fails = recent(`f:${address}`, now, windowMs)
  if (fails.length >= failures) return Math.ceil((fails[fails.length - failures]! + windowMs - now) / 1000)
  const calls = recent(`c:${address}`, now, 60_000)
  if (calls.length >= perMinute) return Math.ceil((calls[calls.length - perMinute]! + 60_000 - now) / 1000)
  hits.set(`c:${address}`, [...calls, now])
  if (hits.size > 50_000) hits.clear()
  return 0
}

/** Count a lookup that matched nothing. */
export function verifyFailed(address: string, now = Date.now()): void {
  hits.set(`f:${address}`, [...(hits.get(`f:${address}`) ?? []), now])
}
