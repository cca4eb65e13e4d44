// Import and query benchmark (issues 4 and 16): invents a payments ledger of N rows, uploads it to a
// freshly started Mantissa on its own PostgreSQL, and measures upload-to-ready and upload-to-first-chart
// time, the server's memory, and a set of the questions a reporter asks (filters, periods, groups),
// each beside the same question put to DuckDB, an embedded columnar engine, holding the same rows in
// memory. Both run in the same process lifetime, one query after the other, so the machine's load falls
// on both; the ratio is what to read. Figures are printed, never asserted.
//
//   npx tsx bench/import.bench.mjs            # 1,000,000 rows
//   npx tsx bench/import.bench.mjs 10000000   # 10,000,000 rows
import { rmSync, statSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { median, memoryOf, signIn, startBench, uploadAndWait, waitForAfterImport, writeLedger } from './support.mjs'
import { QUESTIONS, openPeer } from './questions.mjs'

const rows = Number(process.argv[2] ?? 1_000_000)
const runs = 5
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
  // The first question a reporter asks of a new dataset, the moment it is ready: its first chart.
  await request('POST', `/api/datasets/${dataset.id}/digit-tests`, { column: 'amount', test: 'first-digit' })
  const firstChart = performance.now()
  // The questions are timed once the indexes and the kept repeated values are in (right before, only slower).
  const afterWork = await waitForAfterImport(bench.database, dataset.id)
  const afterImport = memoryOf(bench.server.pid)
  const importPeak = Math.max(peakRss, afterImport.peakMb)

  // Questions no cell of the import holds are counted from the tested column's records in memory once
  // the server has read them (server/services/datasets/column-scan.ts); the first such question starts it.
  const mixed = QUESTIONS.find(q => q.label.startsWith('three filters'))
  const askedMixed = performance.now()
  let from
  do {
    const reply = await fetch(`${bench.url}/api/datasets/${dataset.id}/digit-tests`, { method: 'POST', headers: { cookie, 'content-type': 'application/json' }, body: JSON.stringify(mixed.body) })
    from = reply.headers.get('x-mantissa-counted-from')
    await reply.arrayBuffer()
  } while (from !== 'records in memory' && performance.now() - askedMixed < 120_000)
  const inMemory = performance.now()

  console.log('loading the same file into DuckDB (in memory)…')
  const peer = await openPeer(file)
  // Each question is asked once before the five timed runs, on both sides, and that first ask is
  // printed apart: a server that has answered for a while has its code compiled (V8 takes a few
  // answers to optimise a path it has not run), and the peer warms its caches too.
  const time = async (run) => {
    const timings = []
    for (let i = 0; i <= runs; i++) {
      const t = performance.now()
      await run()
      timings.push(performance.now() - t)
    }
    return { first: timings[0], median: median(timings.slice(1)) }
  }
  const lines = []
  for (const question of QUESTIONS) {
    let countedFrom = ''
    const ours = await time(async () => {
      const reply = await fetch(`${bench.url}/api/datasets/${dataset.id}/digit-tests`, { method: 'POST', headers: { cookie, 'content-type': 'application/json' }, body: JSON.stringify(question.body) })
      if (!reply.ok) throw new Error(`${question.label}: ${reply.status} ${await reply.text()}`)
      await reply.json()
      countedFrom = reply.headers.get('x-mantissa-counted-from') ?? ''
    })
    const theirs = await time(() => peer.run(question.sql))
    lines.push(`| ${question.label} | ${ours.median.toFixed(0)} ms | ${theirs.median.toFixed(0)} ms | ${(ours.median / theirs.median).toFixed(1)} | ${ours.first.toFixed(0)} / ${theirs.first.toFixed(0)} ms | ${countedFrom} |`)
  }
  peer.close()
  const after = memoryOf(bench.server.pid)
  const peak = Math.max(peakRss, afterImport.peakMb, after.peakMb)
  console.log(`
rows:                         ${rows.toLocaleString('en-GB')} (${(bytes / 1024 ** 2).toFixed(1)} MB)
upload (202 returned):        ${((uploadedAt - started) / 1000).toFixed(2)} s
upload to ready:              ${((ready - started) / 1000).toFixed(2)} s
upload to first chart:        ${((firstChart - started) / 1000).toFixed(2)} s (first digit, whole column, asked when ready)
upload to work after import:  ${((afterWork - started) / 1000).toFixed(2)} s (indexes, statistics, repeated values kept; questions timed after it)
column read into memory:      ${((inMemory - askedMixed) / 1000).toFixed(2)} s after the first question that needs it (${from === 'records in memory' ? 'read' : 'NOT read'})
server RSS before / peak:     ${before.rssMb.toFixed(0)} MB / ${importPeak.toFixed(0)} MB by the end of the import (growth ${(importPeak - before.rssMb).toFixed(0)} MB), ${peak.toFixed(0)} MB after the questions (a column in memory included)

median of ${runs} runs each after a first ask, Mantissa (HTTP, engine statistics included) beside DuckDB (the counts alone):

| question | Mantissa | DuckDB | ratio | first ask, Mantissa / DuckDB | Mantissa counted from |
|---|---|---|---|---|---|
${lines.join('\n')}
`)
}
finally {
  await bench.stop()
  rmSync(file, { force: true })
}
