import { QueryTypes } from 'sequelize'

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
}

export type Admission
  = | { admitted: true, delayed: ThrottleRule[] }
    | { admitted: false, retryAt: Date, rule: ThrottleRule }

interface Row { key: string, failures: number, blocked_until: Date | null, quiet: boolean, now: Date }

/** The wait after the `failures`-th failure under `rule`, in seconds (0 while it is free). */
export function delayAfter(rule: ThrottleRule, failures: number): number {
  if (failures < rule.free) return 0
  return Math.min(rule.capSeconds, rule.baseSeconds * 2 ** (failures - rule.free))
}

/**
 * Counts an attempt against every rule before the secret is checked, under row locks taken in key
 * order: parallel attempts queue on the lock, so no more of them are checked than the counts allow.
 * A waiting key refuses without counting (a refused attempt checks nothing), so an attacker's
 * hammering does not lengthen the wait. `delayed`: the rules this attempt starts a wait on, for the
 * audit trail when the attempt then fails.
 */
export async function admitAttempt(rules: ThrottleRule[]): Promise<Admission> {
  const { sequelize } = useDb()
  const sorted = [...rules].sort((a, b) => a.key.localeCompare(b.key))
  const keys = sorted.map(r => r.key)
  return sequelize.transaction(async (transaction) => {
    await sequelize.query(
      `INSERT INTO sign_in_throttles (key) SELECT unnest(ARRAY[:keys]::text[]) ORDER BY 1 ON CONFLICT (key) DO NOTHING`,
      { replacements: { keys }, transaction },
    )
    const rows = await sequelize.query<Row>(`
      SELECT key, failures, blocked_until, now() AS now,
             last_failure_at < now() - make_interval(secs => (:quiet::jsonb ->> key)::double precision) AS quiet
      FROM sign_in_throttles WHERE key IN (:keys) ORDER BY key FOR UPDATE`, {
      replacements: { keys, quiet: JSON.stringify(Object.fromEntries(sorted.map(r => [r.key, r.quietSeconds]))) },
      type: QueryTypes.SELECT, transaction,
    })
    const byKey = new Map(rows.map(row => [row.key, row]))
    let refusal: { retryAt: Date, rule: ThrottleRule } | null = null
    for (const rule of sorted) {
      const row = byKey.get(rule.key)!
      if (!row.quiet && row.blocked_until && row.blocked_until > row.now && (!refusal || row.blocked_until > refusal.retryAt)) {
        refusal = { retryAt: row.blocked_until, rule }
      }
    }
    if (refusal) return { admitted: false, ...refusal }

    const delayed: ThrottleRule[] = []
    for (const rule of sorted) {
      const row = byKey.get(rule.key)!
      const failures = (row.quiet ? 0 : row.failures) + 1
      const wait = delayAfter(rule, failures)
      if (wait > 0 && failures === rule.free) delayed.push(rule)
      await sequelize.query(`
        UPDATE sign_in_throttles SET failures = :failures, last_failure_at = now(),
          blocked_until = CASE WHEN :wait > 0 THEN now() + make_interval(secs => :wait) END
        WHERE key = :key`, { replacements: { key: rule.key, failures, wait }, transaction })
    }
    return { admitted: true, delayed }
  })
}

/** After a right secret: the keys named start again from nothing. */
export async function forgive(keys: string[]) {
  if (!keys.length) return
  await useDb().sequelize.query('DELETE FROM sign_in_throttles WHERE key IN (:keys)', { replacements: { keys } })
}

/** After a right secret: takes back the one failure counted in advance on keys that a success does not clear. */
export async function uncount(keys: string[]) {
  if (!keys.length) return
  await useDb().sequelize.query(
    'UPDATE sign_in_throttles SET failures = greatest(failures - 1, 0) WHERE key IN (:keys)',
    { replacements: { keys } },
  )
}

/** Lifts every wait on an account (a password reset proved the inbox): its own key and its address pairs. */
export async function forgiveAccount(email: string) {
  await useDb().sequelize.query(
    `DELETE FROM sign_in_throttles WHERE key = :account OR (key LIKE 'pair:%' AND right(key, :length) = :pairTail)`,
    { replacements: { account: `account:${email}`, pairTail: `|${email}`, length: email.length + 1 } },
  )
}
