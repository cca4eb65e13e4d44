// Shared by the benchmarks: an invented payments ledger, a throwaway PostgreSQL with the built app
// on it, and the signed-in requests a reporter would make. Figures are printed, never asserted.
import { spawn } from 'node:child_process'
import { createReadStream, createWriteStream, readFileSync, statSync } from 'node:fs'
import { Readable } from 'node:stream'
import { once } from 'node:events'
import { join } from 'node:path'
import pg from 'pg'
import { ensurePostgres } from '../server/cli/postgres.mjs'
import { buildIfStale, migrate, root, waitForServer } from '../server/cli/prepare.mjs'
import { seededRandom } from '../server/services/demo/seeded-random.ts'

export const demo = JSON.parse(readFileSync(join(root, 'server', 'services', 'demo', 'people.json'), 'utf8'))

/**
 * Writes `rows` invented payments (200 vendors, 9 departments, amounts over four orders of magnitude,
 * dates on 28 days of each month of 2024 and 2025).
 */
export async function writeLedger(path, rows) {
  const next = seededRandom(7)
  const out = createWriteStream(path)
  out.write('payment_ref,paid_on,vendor,department,amount\n')
  let chunk = ''
  for (let i = 0; i < rows; i++) {
    const amount = (10 ** (1.5 + 4 * next())).toFixed(2)
    const month = i % 24
    const paidOn = `${2024 + Math.floor(month / 12)}-${String(1 + (month % 12)).padStart(2, '0')}-${String(1 + (Math.floor(i / 24) % 28)).padStart(2, '0')}`
    chunk += `P${100000 + i},${paidOn},Vendor ${Math.floor(next() * 200)},Dept ${i % 9},${amount}\n`
    if (chunk.length > 1 << 20) {
      if (!out.write(chunk)) await once(out, 'drain')
      chunk = ''
    }
  }
  out.end(chunk)
  await once(out, 'finish')
}

/** Resident and peak memory of a process, from /proc. */
export function memoryOf(pid) {
  const status = readFileSync(`/proc/${pid}/status`, 'utf8')
  const kb = name => Number(status.match(new RegExp(`${name}:\\s+(\\d+)`))?.[1] ?? 0)
  return { rssMb: kb('VmRSS') / 1024, peakMb: kb('VmHWM') / 1024 }
}

/** CPU time a process has used, all its threads, user and system (from /proc; clock ticks of 1/100 s). */
export function cpuSecondsOf(pid) {
  const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ')
  return (Number(fields[11]) + Number(fields[12])) / 100
}

export const median = list => [...list].sort((a, b) => a - b)[Math.floor(list.length / 2)]

/** The value below which a share `q` of the list lies (nearest rank). */
export const percentile = (list, q) => [...list].sort((a, b) => a - b)[Math.min(list.length - 1, Math.max(0, Math.ceil(q * list.length) - 1))] ?? Number.NaN

/**
 * A fresh PostgreSQL of the benchmarks' own and the built app on it, with the demo newsroom. Its
 * ports (app, PostgreSQL, mail sink) are MANTISSA_BENCH_PORT, MANTISSA_BENCH_PG_PORT and
 * MANTISSA_BENCH_MAIL_PORT, 3601, 54369 and 2765 unless set, so checkouts can bench side by side
 * (a cluster keeps the port it was made with: remove .data/pg-bench after changing it).
 */
export async function startBench(port = Number(process.env.MANTISSA_BENCH_PORT ?? 3601)) {
  const database = ensurePostgres({ name: 'bench', port: Number(process.env.MANTISSA_BENCH_PG_PORT ?? 54369), database: 'mantissa_bench', throwaway: true })
  database.recreate()
  migrate(database.url, database.appUrl)
  buildIfStale()
  // BENCH_CPU_PROFILE=<folder> writes the server's CPU profile there when it stops (for Chromium's DevTools);
  // BENCH_CPU_PROFILE_INTERVAL=<µs> samples more often than V8's 1000 µs, to see a single request.
  const profile = process.env.BENCH_CPU_PROFILE
    ? ['--cpu-prof', `--cpu-prof-dir=${process.env.BENCH_CPU_PROFILE}`, `--cpu-prof-interval=${process.env.BENCH_CPU_PROFILE_INTERVAL ?? 1000}`]
    : []
  const server = spawn(process.execPath, [...profile, join(root, '.output', 'server', 'index.mjs')], {
    cwd: root,
    stdio: ['ignore', 'ignore', 'inherit'],
    env: {
      ...process.env, PORT: String(port), NITRO_HOST: '127.0.0.1', NUXT_DATABASE_URL: database.appUrl,
      NUXT_SESSION_PASSWORD: 'bench-only-session-password-of-32-characters', NUXT_DEMO_SEED: 'true',
      NUXT_MAIL_SINK_ENABLED: 'true', NUXT_MAIL_SINK_PORT: process.env.MANTISSA_BENCH_MAIL_PORT ?? '2765', NUXT_UPLOAD_LIMIT_BYTES: String(4 * 1024 ** 3),
      NUXT_STORAGE_BASE: join(root, '.data', 'bench-files'),
    },
  })
  const url = `http://localhost:${port}`
  await waitForServer(url, 120)
  return {
    url,
    server,
    database,
    async stop() {
      // The app first, so that no request still running sees its database go away.
      const exited = once(server, 'exit')
      server.kill('SIGTERM')
      await exited
      database.stop()
    },
  }
}

/**
 * Waits until the work an import does after "ready" is done (indexes, planner statistics, repeated
 * values whole and per text value): until then answers are right but some are slower. Returns when.
 */
export async function waitForAfterImport(database, datasetId, seconds = 600) {
  const client = new pg.Client({ connectionString: database.appUrl })
  await client.connect()
  try {
    for (const until = Date.now() + seconds * 1000; Date.now() < until;) {
      const { rows: [done] } = await client.query(
        // A number column's whole repeats are kept last (import.ts, countRepeats).
        'SELECT bool_and(repeats IS NOT NULL) AS done FROM dataset_columns WHERE dataset_id = $1 AND profiles IS NOT NULL', [datasetId])
      if (done?.done) return performance.now()
      await new Promise(r => setTimeout(r, 200))
    }
    throw new Error('the work after the import did not finish')
  }
  finally {
    await client.end()
  }
}

/** Signs in as a demo member and returns a function for JSON requests with the session cookie. */
export async function signIn(url, role = 'reporter') {
  const login = await fetch(`${url}/api/auth/login`, {
    method: 'POST', headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: demo.people.find(p => p.role === role).email, password: demo.password }),
  })
  const cookie = login.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
  const request = async (method, path, body) => {
    const reply = await fetch(`${url}${path}`, {
      method, headers: { cookie, ...(body === undefined ? {} : { 'content-type': 'application/json' }) },
      body: body === undefined ? undefined : JSON.stringify(body),
    })
    if (!reply.ok) throw new Error(`${method} ${path} answered ${reply.status}: ${await reply.text()}`)
    return reply.json()
  }
  return { cookie, request }
}

/**
 * Uploads a file as a browser or curl would, streaming one multipart body, and waits until its
 * import settles; `onPoll` sees each status. (Node's FormData with a Blob took about 0.6 s longer
 * than curl to send the same 42 MB, which is the client's time, not the server's.)
 */
export async function uploadAndWait(url, cookie, file, title, onPoll = () => {}) {
  const boundary = `mantissa-bench-${Date.now()}`
  const head = Buffer.from(`--${boundary}\r\ncontent-disposition: form-data; name="title"\r\n\r\n${title}\r\n`
    + `--${boundary}\r\ncontent-disposition: form-data; name="file"; filename="ledger.csv"\r\ncontent-type: text/csv\r\n\r\n`)
  const tail = Buffer.from(`\r\n--${boundary}--\r\n`)
  async function* body() {
    yield head
    yield* createReadStream(file, { highWaterMark: 1 << 20 })
    yield tail
  }
  const upload = await fetch(`${url}/api/datasets`, {
    method: 'POST',
    headers: { cookie, 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': String(head.length + statSync(file).size + tail.length) },
    body: Readable.toWeb(Readable.from(body())),
    duplex: 'half',
  })
  const { id } = await upload.json()
  const uploadedAt = performance.now()
  let dataset
  do {
    await new Promise(r => setTimeout(r, 50))
    dataset = await (await fetch(`${url}/api/datasets/${id}`, { headers: { cookie } })).json()
    onPoll(dataset)
  } while (dataset.status === 'importing')
  if (dataset.status !== 'ready') throw new Error(`import ${dataset.status}: ${dataset.error}`)
  return { dataset, uploadedAt }
}
