/**
 * The rate-limit policies of the open and password-taking routes, counted by ./rateLimit.ts in the
 * database. Limits are configurable (README, "Configuration").
 *
 * Sign-in: failures are counted per (account, address), per account and, for accounts that do not
 * exist, per address.
 * - (account, address) past LOGIN_MAX_FAILURES (5) in the window → that pair waits (429);
 * - account past LOGIN_MAX_FAILURES_PER_ACCOUNT (20) from all addresses → every further attempt
 *   on it is slowed by a growing delay (0.25 s doubling up to 8 s), so guessing from many
 *   addresses stays slow while the owner can still sign in;
 * - unknown accounts past LOGIN_MAX_FAILURES_PER_ADDRESS (100) from one address → failed attempts
 *   from that address answer 429, but a correct sign-in of a known user from it still succeeds:
 *   a crowd behind one proxy cannot lock out its colleagues.
 *
 * Signing passwords: per signatory and per address, like sign-in's pair limit.
 * Public verification: VERIFY_MAX_PER_MINUTE lookups a minute and VERIFY_MAX_FAILURES failed ones
 * in VERIFY_WINDOW_MINUTES per address, so codes cannot be guessed by trying.
 */
import { config } from './config'
import { countHits, forgetHits, recordHits, waitSeconds } from './rateLimit'

const pairKey = (scope: string, who: string, address: string) => `${scope}:pair:${who}|${address}`

export interface SignInGate {
  /** Seconds the (account, address) pair must wait; 0 = may try. */
  wait: number
  /** Milliseconds to hold the answer (an account under attack from many addresses). */
  delayMs: number
  /** The address has failed on unknown accounts past its ceiling. */
  addressOverCeiling: boolean
}

/** Whether a sign-in attempt may be tried now, and how slowly. */
export async function signInGate(email: string, address: string, now = Date.now()): Promise<SignInGate> {
  const { maxFailures, maxFailuresPerAccount, maxFailuresPerAddress, windowMs } = config().login
  const [wait, accountFailures, addressFailures] = await Promise.all([
    waitSeconds(pairKey('login', email, address), maxFailures, windowMs, now),
    countHits(`login:account:${email}`, windowMs, now),
    countHits(`login:address:${address}`, windowMs, now),
  ])
  const over = accountFailures - maxFailuresPerAccount
  return {
    wait,
    delayMs: over >= 0 ? Math.min(8000, 250 * 2 ** Math.min(over, 5)) : 0,
    addressOverCeiling: addressFailures >= maxFailuresPerAddress,
  }
}

/** Count a failed sign-in; `knownAccount` false when no user has this e-mail. */
export async function recordSignInFailure(email: string, address: string, knownAccount: boolean, now = Date.now()): Promise<void> {
  const keys = [pairKey('login', email, address), `login:account:${email}`]
  if (!knownAccount) keys.push(`login:address:${address}`)
  await recordHits(keys, now)
}

/** A successful sign-in forgets the failures of its (account, address) pair. */
export async function clearSignInFailures(email: string, address: string): Promise<void> {
  await forgetHits(pairKey('login', email, address))
}

/** Seconds before a signatory may enter a password again (0 = now). */
export async function signingPasswordWait(userId: number, address: string, now = Date.now()): Promise<number> {
  const { maxFailures, windowMs } = config().login
  return Math.max(
    await waitSeconds(`sign:user:${userId}`, maxFailures, windowMs, now),
    await waitSeconds(pairKey('sign', String(userId), address), maxFailures, windowMs, now),
  )
}

export async function recordSigningFailure(userId: number, address: string, now = Date.now()): Promise<void> {
  await recordHits([`sign:user:${userId}`, pairKey('sign', String(userId), address)], now)
}

export async function clearSigningFailures(userId: number, address: string): Promise<void> {
  await forgetHits(`sign:user:${userId}`)
  await forgetHits(pairKey('sign', String(userId), address))
}

/** Seconds until this address may verify again (0 = now); counts this lookup when allowed. */
export async function verifyThrottle(address: string, now = Date.now()): Promise<number> {
  const { maxPerMinute, maxFailures, windowMs } = config().verify
  const wait = (await waitSeconds(`verify:fail:${address}`, maxFailures, windowMs, now)) || (await waitSeconds(`verify:count:${address}`, maxPerMinute, 60_000, now))
  if (wait === 0) await recordHits([`verify:count:${address}`], now, 60_000)
  return wait
}

/** Count a verification that matched nothing. */
export async function verifyFailed(address: string, now = Date.now()): Promise<void> {
  await recordHits([`verify:fail:${address}`], now)
}
