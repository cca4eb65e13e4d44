// Import and query benchmark (issue 4): invents a payments ledger of N rows, uploads it to a
// freshly started Mantissa on its own PostgreSQL, and measures upload-to-ready time, the server's
// memory, and a first-two-digits test grouped by vendor. Figures are printed, never asserted.
//
//   npx tsx bench/import.bench.mjs            # 1,000,000 rows
//   npx tsx bench/import.bench.mjs 10000000   # 10,000,000 rows
import { rmSync, statSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { median, memoryOf, signIn, startBench, uploadAndWait, writeLedger } from './support.mjs'

const rows = Number(process.argv[2] ?? 1_000_000)
const file = join(tmpdir(), `mantissa-bench-${rows}.csv`)
console.log(`writing ${rows.toLocaleString('en-GB')} invented payments to ${file}…`)
await writeLedger(file, rows)
const bytes = statSync(file).size

const bench = await startBench()
try {
  const { cookie, request } = await signIn(bench.url)
  const before = memoryOf(bench.server.pid)
  let peakRss = 0
  const started = performance.now()
  const { dataset, uploadedAt } = await uploadAndWait(bench.url, cookie, file, `Bench ledger ${rows}`, () => {
    peakRss = Math.max(peakRss, memoryOf(bench.server.pid).rssMb)
  })
  const ready = performance.now()

  const time = async (body) => {
    const timings = []
    for (let i = 0; i < 5; i++) {
      const t = performance.now()
      await request('POST', `/api/datasets/${dataset.id}/digit-tests`, body)
      timings.push(performance.now() - t)
    }
    return timings
  }
  const grouped = await time({ column: 'amount', test: 'first-two-digits', groupBy: 'vendor' })
  const plain = await time({ column: 'amount', test: 'first-digit' })
  const filtered = await time({ column: 'amount', test: 'first-two-digits', groupBy: 'vendor', filters: [{ column: 'amount', op: 'between', min: 100 }] })
  const after = memoryOf(bench.server.pid)
  const peak = Math.max(peakRss, after.peakMb)
  console.log(`
rows:                         ${rows.toLocaleString('en-GB')} (${(bytes / 1024 ** 2).toFixed(1)} MB)
upload (202 returned):        ${((uploadedAt - started) / 1000).toFixed(2)} s
upload to ready:              ${((ready - started) / 1000).toFixed(2)} s
server RSS before / peak:     ${before.rssMb.toFixed(0)} MB / ${peak.toFixed(0)} MB (growth ${(peak - before.rssMb).toFixed(0)} MB)
first-two digits by vendor:   median ${median(grouped).toFixed(0)} ms (runs: ${grouped.map(t => t.toFixed(0)).join(', ')})
first digit, whole column:    median ${median(plain).toFixed(0)} ms
first-two by vendor, amount ≥ 100 (counted from the records): median ${median(filtered).toFixed(0)} ms
`)
}
finally {
  await bench.stop()
  rmSync(file, { force: true })
}
