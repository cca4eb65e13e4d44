import { readFile, writeFile } from 'node:fs/promises'

// The app server that `npm test` starts runs in its own process; these read what Linux tells of it
// (/proc/<pid>/status) and what it logged, so a test can bound its memory and catch errors it only logs.

function serverPid(): number {
  const pid = Number(process.env.MANTISSA_TEST_SERVER_PID)
  if (!(pid > 0)) throw new Error('MANTISSA_TEST_SERVER_PID must name the test server\'s process (npm test passes it)')
  return pid
}

async function statusField(pid: number, field: 'VmHWM' | 'VmRSS'): Promise<number> {
  const status = await readFile(`/proc/${pid}/status`, 'utf8')
  const kilobytes = Number(status.match(new RegExp(`^${field}:\\s+(\\d+) kB`, 'm'))?.[1])
  if (!(kilobytes > 0)) throw new Error(`no ${field} in /proc/${pid}/status`)
  return kilobytes * 1024
}

/**
 * How far above its resident memory at the start the server's peak went while `action` ran, in
 * bytes. Writing 5 to clear_refs resets the peak (VmHWM) to the current size (proc(5)).
 */
export async function serverPeakGrowthDuring(action: () => Promise<unknown>): Promise<number> {
  const pid = serverPid()
  await writeFile(`/proc/${pid}/clear_refs`, '5')
  const before = await statusField(pid, 'VmRSS')
  await action()
  return await statusField(pid, 'VmHWM') - before
}

/** Lines the server logged for errors nothing handled (Nitro prints them as "[unhandledRejection] …"). */
export async function unhandledErrorsLogged(): Promise<string[]> {
  const log = process.env.MANTISSA_TEST_SERVER_LOG
  if (!log) throw new Error('MANTISSA_TEST_SERVER_LOG must name the test server\'s log (npm test passes it)')
  return (await readFile(log, 'utf8')).split('\n').filter(line => /\[(unhandledRejection|uncaughtException)\]/.test(line))
}
