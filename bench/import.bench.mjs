// Import and query benchmark (issue 4): invents a payments ledger of N rows, uploads it to a
// freshly started Mantissa on its own PostgreSQL, and measures upload-to-ready time, the server's
// memory, and a first-two-digits test grouped by vendor. Figures are printed, never asserted.
//
//   node bench/import.bench.mjs            # 1,000,000 rows
//   node bench/import.bench.mjs 10000000   # 10,000,000 rows
import { spawn } from 'node:child_process'
import { createWriteStream, readFileSync, rmSync, statSync } from 'node:fs'
import { once } from 'node:events'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { ensurePostgres } from '../server/cli/postgres.mjs'
import { buildIfStale, migrate, root, waitForServer } from '../server/cli/prepare.mjs'

const rows = Number(process.argv[2] ?? 1_000_000)
const port = 3201
const url = `http://localhost:${port}`
const demo = JSON.parse(readFileSync(join(root, 'server', 'services', 'demo', 'people.json'), 'utf8'))

function random(seed) {
  let state = seed >>> 0
  return () => {
    state = (state + 0x6D2B79F5) >>> 0
    let t = state
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

async function writeLedger(path) {
  const next = random(7)
  const out = createWriteStream(path)
  out.write('payment_ref,paid_on,vendor,department,amount\n')
  let chunk = ''
  for (let i = 0; i < rows; i++) {
    const amount = (10 ** (1.5 + 4 * next())).toFixed(2)
    chunk += `P${100000 + i},2025-${String(1 + (i % 12)).padStart(2, '0')}-15,Vendor ${Math.floor(next() * 200)},Dept ${i % 9},${amount}\n`
    if (chunk.length > 1 << 20) {
      if (!out.write(chunk)) await once(out, 'drain')
      chunk = ''
    }
  }
  out.end(chunk)
  await once(out, 'finish')
}

function memoryOf(pid) {
  const status = readFileSync(`/proc/${pid}/status`, 'utf8')
  const kb = name => Number(status.match(new RegExp(`${name}:\\s+(\\d+)`))?.[1] ?? 0)
  return { rssMb: kb('VmRSS') / 1024, peakMb: kb('VmHWM') / 1024 }
}

const median = list => [...list].sort((a, b) => a - b)[Math.floor(list.length / 2)]

const file = join(tmpdir(), `mantissa-bench-${rows}.csv`)
console.log(`writing ${rows.toLocaleString('en-GB')} invented payments to ${file}…`)
await writeLedger(file)
const bytes = statSync(file).size

const database = ensurePostgres({ name: 'bench', port: 54349, database: 'mantissa_bench', throwaway: true })
database.recreate()
migrate(database.url)
buildIfStale()
const server = spawn(process.execPath, [join(root, '.output', 'server', 'index.mjs')], {
  cwd: root,
  stdio: ['ignore', 'ignore', 'inherit'],
  env: {
    ...process.env, PORT: String(port), NITRO_HOST: '127.0.0.1', NUXT_DATABASE_URL: database.url,
    NUXT_SESSION_PASSWORD: 'bench-only-session-password-of-32-characters', NUXT_DEMO_SEED: 'true',
    NUXT_MAIL_SINK_ENABLED: 'true', NUXT_MAIL_SINK_PORT: '2725', NUXT_UPLOAD_LIMIT_BYTES: String(4 * 1024 ** 3),
    NUXT_STORAGE_BASE: join(root, '.data', 'bench-files'),
  },
})
try {
  await waitForServer(url, 120)
  const login = await fetch(`${url}/api/auth/login`, {
    method: 'POST', headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: demo.people.find(p => p.role === 'reporter').email, password: demo.password }),
  })
  const cookie = login.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
  const before = memoryOf(server.pid)

  const started = performance.now()
  const form = new FormData()
  form.append('title', `Bench ledger ${rows}`)
  const { openAsBlob } = await import('node:fs')
  form.append('file', await openAsBlob(file), 'bench.csv')
  const upload = await fetch(`${url}/api/datasets`, { method: 'POST', headers: { cookie }, body: form })
  const { id } = await upload.json()
  const uploaded = performance.now()
  let dataset
  let peakRss = 0
  do {
    await new Promise(r => setTimeout(r, 200))
    dataset = await (await fetch(`${url}/api/datasets/${id}`, { headers: { cookie } })).json()
    peakRss = Math.max(peakRss, memoryOf(server.pid).rssMb)
  } while (dataset.status === 'importing')
  const ready = performance.now()
  if (dataset.status !== 'ready') throw new Error(`import ${dataset.status}: ${dataset.error}`)

  const body = JSON.stringify({ column: 'amount', test: 'first-two-digits', groupBy: 'vendor' })
  const timings = []
  for (let i = 0; i < 5; i++) {
    const t = performance.now()
    const reply = await fetch(`${url}/api/datasets/${id}/digit-tests`, { method: 'POST', headers: { cookie, 'content-type': 'application/json' }, body })
    await reply.json()
    timings.push(performance.now() - t)
  }
  const plain = []
  for (let i = 0; i < 5; i++) {
    const t = performance.now()
    await (await fetch(`${url}/api/datasets/${id}/digit-tests`, { method: 'POST', headers: { cookie, 'content-type': 'application/json' }, body: JSON.stringify({ column: 'amount', test: 'first-digit' }) })).json()
    plain.push(performance.now() - t)
  }
  const after = memoryOf(server.pid)
  console.log(`
rows:                         ${rows.toLocaleString('en-GB')} (${(bytes / 1024 ** 2).toFixed(1)} MB)
upload (202 returned):        ${((uploaded - started) / 1000).toFixed(2)} s
upload to ready:              ${((ready - started) / 1000).toFixed(2)} s
server RSS before / peak:     ${before.rssMb.toFixed(0)} MB / ${Math.max(peakRss, after.peakMb).toFixed(0)} MB (growth ${(Math.max(peakRss, after.peakMb) - before.rssMb).toFixed(0)} MB)
first-two digits by vendor:   median ${median(timings).toFixed(0)} ms (runs: ${timings.map(t => t.toFixed(0)).join(', ')})
first digit, whole column:    median ${median(plain).toFixed(0)} ms
`)
}
finally {
  server.kill('SIGTERM')
  rmSync(file, { force: true })
  database.stop()
}
