import type { ThrottleRule } from './throttle'

const MINUTE = 60
const HOUR = 60 * MINUTE

// Why three keys (issue 18): a per-account limit alone lets anyone lock a member out by typing
// wrong passwords, and a per-address limit alone lets a botnet guess one account from many places.
// - this address on this account: 5 free failures, then 30 s, 1 min, 2 min … up to 15 min;
// - this account from addresses it has never signed in from: 20 free, then 1 min doubling to 1 h
//   (a member at their usual address is never held back by strangers' guesses);
// - this address on any account (spraying one password over many): 50 free, then 1 min doubling to 1 h.
// A right password clears the first two; on the third it only settles its own attempt. The counts are common practice for web sign-in, not a standard.
export function passwordRules(ip: string, email: string, knownAddress: boolean): ThrottleRule[] {
  return [
    { key: `pair:${ip}|${email}`, free: 5, baseSeconds: 30, capSeconds: 15 * MINUTE, quietSeconds: 2 * HOUR, clearedBySuccess: true },
    ...knownAddress ? [] : [{ key: `account:${email}`, free: 20, baseSeconds: MINUTE, capSeconds: HOUR, quietSeconds: 6 * HOUR, clearedBySuccess: true }],
    { key: `address:${ip}`, free: 50, baseSeconds: MINUTE, capSeconds: HOUR, quietSeconds: 6 * HOUR, clearedBySuccess: false },
  ]
}

/** Codes from an authenticator (a million of them): 5 free failures per account, then 30 s doubling to 15 min. */
export function secondFactorRule(userId: string): ThrottleRule {
  return { key: `code:${userId}`, free: 5, baseSeconds: 30, capSeconds: 15 * MINUTE, quietSeconds: 2 * HOUR, clearedBySuccess: true }
}
