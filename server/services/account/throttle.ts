import { QueryTypes } from 'sequelize'
import type { Transaction } from 'sequelize'

/**
 * A failure counter with growing delays. After `free` failures each further failure makes the key
 * wait `baseSeconds`, then twice that, and so on up to `capSeconds`; a key quiet for `quietSeconds`
 * starts again from nothing.
 */
export interface ThrottleRule {
  key: string
  free: number
  baseSeconds: number
  capSeconds: number
  quietSeconds: number
  /** A right secret sets the failures back to none (else it only settles its own attempt). */
  clearedBySuccess: boolean
}

export type Admission
  = | { admitted: true, rules: ThrottleRule[] }
    | { admitted: false, retryAt: Date }

interface Row { failures: number, blocked_until: Date | null, quiet: boolean, pending: number, now: Date }

/** An attempt's unsettled count lapses after this long, so a server that died mid-check holds nothing back for good. */
const PENDING_LAPSE_SECONDS = 15
/** How long an attempt waits for attempts in flight on its keys to settle before it answers 429. */
const QUEUE_MS = 10_000
const POLL_MS = 50

/** The wait after the `failures`-th failure under `rule`, in seconds (0 while it is free). */
export function delayAfter(rule: ThrottleRule, failures: number): number {
  if (failures < rule.free) return 0
  return Math.min(rule.capSeconds, rule.baseSeconds * 2 ** (failures - rule.free))
}

/** The key's row, created when missing, locked for the transaction. */
async function lockRow(rule: ThrottleRule, transaction: Transaction): Promise<Row> {
  const [row] = await useDb().sequelize.query<Row>(`
    INSERT INTO sign_in_throttles AS t (key) VALUES (:key)
    ON CONFLICT (key) DO UPDATE SET key = t.key
    RETURNING failures, blocked_until, now() AS now,
      last_failure_at < now() - make_interval(secs => :quiet) AS quiet,
      CASE WHEN pending_at > now() - make_interval(secs => :lapse) THEN pending ELSE 0 END AS pending`, {
    replacements: { key: rule.key, quiet: rule.quietSeconds, lapse: PENDING_LAPSE_SECONDS },
    type: QueryTypes.SELECT, transaction,
  })
  return row!
}

type Decision = { kind: 'admit' } | { kind: 'refuse', retryAt: Date } | { kind: 'queue' }

/**
 * Whether one more check may start on a key. Attempts in flight count as failures until they
 * settle, so no more secrets are checked than the free failures left (after them, one at a time
 * once the wait is over); a key that could only refuse because of attempts in flight queues.
 */
function decide(rule: ThrottleRule, row: Row): Decision {
  const failures = row.quiet ? 0 : row.failures
  if (!row.quiet && row.blocked_until && row.blocked_until > row.now) return { kind: 'refuse', retryAt: row.blocked_until }
  const room = failures < rule.free ? rule.free - failures : 1
  return row.pending < room ? { kind: 'admit' } : { kind: 'queue' }
}

/**
 * Admits an attempt before its secret is checked, under row locks taken in key order: parallel
 * attempts queue on the locks and on each other, so a burst checks no more guesses than the counts
 * allow, while a right password sent twice at once still gets in. A waiting key refuses without
 * counting, so hammering does not lengthen the wait. Every admitted attempt must be `settle`d.
 */
export async function admitAttempt(rules: ThrottleRule[]): Promise<Admission> {
  const { sequelize } = useDb()
  const sorted = [...rules].sort((a, b) => a.key.localeCompare(b.key))
  const until = Date.now() + QUEUE_MS
  for (;;) {
    const decision = await sequelize.transaction(async (transaction): Promise<Decision> => {
      const decisions: Decision[] = []
      for (const rule of sorted) decisions.push(decide(rule, await lockRow(rule, transaction)))
      const refusals = decisions.filter((d): d is Extract<Decision, { kind: 'refuse' }> => d.kind === 'refuse')
      if (refusals.length) return { kind: 'refuse', retryAt: new Date(Math.max(...refusals.map(r => r.retryAt.getTime()))) }
      if (decisions.some(d => d.kind === 'queue')) return { kind: 'queue' }
      await sequelize.query(
        `UPDATE sign_in_throttles SET pending = CASE WHEN pending_at > now() - make_interval(secs => :lapse) THEN pending ELSE 0 END + 1, pending_at = now() WHERE key IN (:keys)`,
        { replacements: { keys: sorted.map(r => r.key), lapse: PENDING_LAPSE_SECONDS }, transaction },
      )
      return { kind: 'admit' }
    })
    if (decision.kind === 'admit') return { admitted: true, rules: sorted }
    if (decision.kind === 'refuse') return { admitted: false, retryAt: decision.retryAt }
    if (Date.now() > until) return { admitted: false, retryAt: new Date(Date.now() + 1000) }
    await new Promise(resolve => setTimeout(resolve, POLL_MS))
  }
}

/**
 * Settles an admitted attempt: a failure is counted (and may start a wait), a success clears the
 * keys that a right secret clears. Returns the rules on which this failure started a wait, for
 * the audit trail.
 */
export async function settle(admission: Extract<Admission, { admitted: true }>, succeeded: boolean): Promise<ThrottleRule[]> {
  const { sequelize } = useDb()
  return sequelize.transaction(async (transaction) => {
    const delayed: ThrottleRule[] = []
    for (const rule of admission.rules) {
      const row = await lockRow(rule, transaction)
      const failures = succeeded ? (rule.clearedBySuccess ? 0 : row.quiet ? 0 : row.failures) : (row.quiet ? 0 : row.failures) + 1
      const wait = succeeded && rule.clearedBySuccess ? 0 : delayAfter(rule, failures)
      if (!succeeded && wait > 0 && failures === rule.free) delayed.push(rule)
      await sequelize.query(`
        UPDATE sign_in_throttles SET pending = greatest(pending - 1, 0), failures = :failures,
          last_failure_at = CASE WHEN :failed THEN now() ELSE last_failure_at END,
          blocked_until = CASE WHEN :failed AND :wait > 0 THEN now() + make_interval(secs => :wait)
                               WHEN :cleared THEN NULL ELSE blocked_until END
        WHERE key = :key`, {
        replacements: { key: rule.key, failures, wait, failed: !succeeded, cleared: succeeded && rule.clearedBySuccess },
        transaction,
      })
    }
    return delayed
  })
}

/** Lifts every wait on an account (a password reset proved the inbox): its own key and its address pairs. */
export async function forgiveAccount(email: string) {
  await useDb().sequelize.query(
    `UPDATE sign_in_throttles SET failures = 0, blocked_until = NULL
     WHERE key = :account OR (key LIKE 'pair:%' AND right(key, :length) = :pairTail)`,
    { replacements: { account: `account:${email}`, pairTail: `|${email}`, length: email.length + 1 } },
  )
}
