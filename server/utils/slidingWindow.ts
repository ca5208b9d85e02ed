/**
 * Timestamps per key in a sliding time window, kept in the server's memory (a restart forgets
 * them) and bounded in size under a flood. The throttles of sign-in and verification count with it.
 */
export class SlidingWindow {
  private readonly hits = new Map<string, number[]>()
  constructor(private readonly maxKeys = 50_000) {}

  /** The key's hits within the last `windowMs` milliseconds; older ones are forgotten. */
  recent(key: string, now: number, windowMs: number): number[] {
    const list = (this.hits.get(key) ?? []).filter(t => now - t < windowMs)
    if (list.length) this.hits.set(key, list)
    else this.hits.delete(key)
    return list
  }

  add(key: string, now: number): void {
    this.hits.set(key, [...(this.hits.get(key) ?? []), now])
    if (this.hits.size > this.maxKeys) this.hits.clear()
  }

  forget(key: string): void {
    this.hits.delete(key)
  }

  /** Seconds until the key has fewer than `max` hits in the window; 0 when it already has. */
  waitSeconds(key: string, max: number, windowMs: number, now: number): number {
    const list = this.recent(key, now, windowMs)
    return list.length >= max ? Math.ceil((list[list.length - max]! + windowMs - now) / 1000) : 0
  }
}
