// Load benchmark (issues 8 and 16): 50 connections for 60 s on loopback against the analysis routes
// (unfiltered, and the filtered questions of an investigation) and the read routes of a 1M-row
// dataset, on a fresh Mantissa with its own PostgreSQL. Prints throughput, latency percentiles and
// errors per route mix; never asserts.
//
//   npx tsx bench/load.bench.mjs                 # 1,000,000 rows, 50 connections, 60 s
//   npx tsx bench/load.bench.mjs 100000 50 20    # rows, connections, seconds
//   npx tsx bench/load.bench.mjs 1000000 50 60 filtered   # only the mixes whose name holds "filtered"
import { rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import autocannon from 'autocannon'
import { cpuSecondsOf, memoryOf, percentile, signIn, startBench, uploadAndWait, waitForAfterImport, writeLedger } from './support.mjs'

/** A question's settings in a few words, for the table by request. */
const describe = body => [body.test, body.groupBy && `by ${body.groupBy}${body.period ? ` (${body.period})` : ''}`, ...(body.filters ?? []).map(f => `${f.column} ${f.op} ${f.value ?? f.values ?? [f.min, f.max, f.from, f.to].filter(v => v !== undefined).join('–')}`)].filter(Boolean).join(', ')

const [rows = 1_000_000, connections = 50, seconds = 60] = process.argv.slice(2, 5).map(Number)
// A fourth argument runs only the mixes whose name holds it ("filtered").
const only = process.argv[5]
const file = join(tmpdir(), `mantissa-load-${rows}.csv`)
await writeLedger(file, rows)
const bench = await startBench()
try {
  const { cookie, request } = await signIn(bench.url)
  const { dataset } = await uploadAndWait(bench.url, cookie, file, `Load ledger ${rows}`)
  await waitForAfterImport(bench.database, dataset.id)
  rmSync(file, { force: true })
  const me = await request('GET', '/api/me')
  const story = await request('POST', '/api/investigations', { newsroomId: me.memberships[0].newsroomId, title: 'Load test' })
  const block = await request('POST', `/api/investigations/${story.id}/blocks`, {
    kind: 'analysis', settings: { datasetId: dataset.id, column: 'amount', test: 'first-two-digits', groupBy: 'vendor' },
  })
  await request('POST', `/api/blocks/${block.id}/run`)

  const json = body => ({ method: 'POST', path: `/api/datasets/${dataset.id}/digit-tests`, headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) })
  // Each request's own latencies, from its sending to its answer (one request at a time per connection).
  const latencies = new Map()
  const timed = requests => requests.map((request, i) => {
    const label = request.body ? describe(JSON.parse(request.body)) : `${request.method} ${request.path.replace(/[0-9a-f-]{36}/g, ':id')}`
    return {
      ...request,
      setupRequest: (req, context) => {
        context[`sent${i}`] = performance.now()
        return req
      },
      onResponse: (_status, _body, context) => {
        const list = latencies.get(label) ?? latencies.set(label, []).get(label)
        list.push(performance.now() - context[`sent${i}`])
      },
    }
  })
  // What a newsroom does all day: open a story and its blocks, run tests, read the rows behind a bin.
  const mix = {
    'analysis: digit tests': [
      json({ column: 'amount', test: 'first-digit' }),
      json({ column: 'amount', test: 'first-two-digits', groupBy: 'vendor' }),
      json({ column: 'amount', test: 'second-digit', groupBy: 'department' }),
      json({ column: 'amount', test: 'last-two-digits' }),
      { method: 'POST', path: `/api/blocks/${block.id}/run` },
    ],
    // The questions of an investigation: one department, a floor, a period, one vendor's repeats.
    'filtered questions': [
      json({ column: 'amount', test: 'first-two-digits', filters: [{ column: 'amount', op: 'between', min: 100 }] }),
      json({ column: 'amount', test: 'first-two-digits', groupBy: 'vendor', filters: [{ column: 'amount', op: 'between', min: 150, max: 20000 }] }),
      json({ column: 'amount', test: 'first-digit', groupBy: 'vendor', filters: [{ column: 'department', op: 'equals', value: 'Dept 3' }] }),
      json({ column: 'amount', test: 'first-two-digits', filters: [{ column: 'paid_on', op: 'dates', from: '2025-03-01', to: '2025-06-30' }] }),
      json({ column: 'amount', test: 'second-digit', groupBy: 'paid_on', period: 'month' }),
      json({ column: 'amount', test: 'duplicates', filters: [{ column: 'department', op: 'equals', value: 'Dept 5' }] }),
      json({ column: 'amount', test: 'first-two-digits', groupBy: 'vendor', filters: [{ column: 'amount', op: 'between', min: 1000 }, { column: 'department', op: 'equals', value: 'Dept 2' }] }),
    ],
    'read: story, dataset, rows': [
      { method: 'GET', path: `/api/investigations/${story.id}` },
      { method: 'GET', path: `/api/blocks/${block.id}/analysis` },
      { method: 'GET', path: `/api/datasets/${dataset.id}` },
      { method: 'GET', path: `/api/datasets/${dataset.id}/rows?column=amount&key=48&test=first-two-digits&page=2` },
      { method: 'GET', path: `/api/datasets/${dataset.id}/preview?page=3` },
    ],
  }
  for (const [name, requests] of Object.entries(mix).filter(([name]) => !only || name.includes(only))) {
    const before = memoryOf(bench.server.pid)
    const cpuBefore = cpuSecondsOf(bench.server.pid)
    latencies.clear()
    const result = await autocannon({ url: bench.url, connections, duration: seconds, headers: { cookie }, requests: timed(requests) })
    const after = memoryOf(bench.server.pid)
    const cpu = cpuSecondsOf(bench.server.pid) - cpuBefore
    const errors = result.errors + result.timeouts + result.non2xx
    console.log(`
${name} (${connections} connections, ${seconds} s, ${rows.toLocaleString('en-GB')} rows)
  requests:    ${result.requests.total.toLocaleString('en-GB')} (${result.requests.average.toFixed(0)} per second)
  latency:     p50 ${result.latency.p50} ms, p99 ${result.latency.p99} ms, max ${result.latency.max} ms
  errors:      ${errors} (socket ${result.errors}, timeouts ${result.timeouts}, non-2xx ${result.non2xx})
  server CPU:  ${cpu.toFixed(1)} s over ${seconds} s (${(1000 * cpu / result.requests.total).toFixed(1)} ms a request, all its threads)
  server RSS:  ${before.rssMb.toFixed(0)} → ${after.rssMb.toFixed(0)} MB (peak ${after.peakMb.toFixed(0)} MB)
  by request (p50 / p99 / count):
${[...latencies].map(([label, list]) => `    ${percentile(list, 0.5).toFixed(0).padStart(6)} / ${percentile(list, 0.99).toFixed(0).padStart(6)} ms  ${String(list.length).padStart(6)}  ${label}`).join('\n')}`)
  }
}
finally {
  await bench.stop()
  rmSync(file, { force: true })
}
