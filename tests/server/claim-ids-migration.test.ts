import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { execFileSync } from 'node:child_process'
import { readdirSync } from 'node:fs'
import { join } from 'node:path'
import pg from 'pg'
import { Sequelize } from 'sequelize'
import { SequelizeStorage, Umzug } from 'umzug'
import type { MigrationFn } from 'umzug'
import { ensurePostgres } from '../../server/cli/postgres.mjs'
import { root } from '../../server/cli/prepare.mjs'
import { DEMO_CLAIMS, DEMO_STORY } from '../../server/services/demo/story'

// Migration 0100 makes a claim's id name it within its investigation only (issue 22: "Existence
// never leaks"). It must carry every claim of an install across as it was: here, the demo story's
// three claims (one verified, one disputed, one open) in a database migrated to just before it.

const FIRST = '0100-claim-ids-per-investigation.ts'
// The migration files as the migrator names them; loaded through vitest, which reads TypeScript.
const folder = join(root, 'server', 'db', 'migrations')
type Step = { up: MigrationFn<Sequelize>, down: MigrationFn<Sequelize> }
const migrations = readdirSync(folder).filter(name => name.endsWith('.ts')).sort().map(name => ({
  name,
  up: async (params: { context: Sequelize }) => ((await import(join(folder, name))) as Step).up(params as never),
  down: async (params: { context: Sequelize }) => ((await import(join(folder, name))) as Step).down(params as never),
}))

const database = ensurePostgres({ name: 'test', port: Number(process.env.MANTISSA_TEST_PG_PORT ?? 54339), database: 'mantissa_claim_ids', throwaway: true })
let owner: Sequelize
let umzug: Umzug<Sequelize>

const query = async <R>(sql: string, replacements: Record<string, unknown> = {}) => (await owner.query(sql, { replacements }))[0] as R[]
const claimRows = () => query<Record<string, unknown>>('SELECT * FROM claims ORDER BY id')
const keyColumns = async () => (await query<{ column: string }>(`
  SELECT a.attname AS column FROM pg_index i JOIN pg_attribute a ON a.attrelid = i.indrelid AND a.attnum = ANY(i.indkey)
  WHERE i.indrelid = 'claims'::regclass AND i.indisprimary ORDER BY array_position(i.indkey, a.attnum)`)).map(r => r.column)

/** The demo's newsroom, people, story and claims, written as rows the way the seed leaves them. */
async function writeDemo(): Promise<{ investigationId: string, secondId: string }> {
  const [newsroom] = await query<{ id: string }>(`INSERT INTO newsrooms (name) VALUES ('Port Averly Courier') RETURNING id`)
  const [reporter] = await query<{ id: string }>(`INSERT INTO users (email, name, password_hash) VALUES ('reporter@demo.example', 'Demo reporter', 'x') RETURNING id`)
  const [checker] = await query<{ id: string }>(`INSERT INTO users (email, name, password_hash) VALUES ('checker@demo.example', 'Demo checker', 'x') RETURNING id`)
  const investigation = async (title: string) => (await query<{ id: string }>('INSERT INTO investigations (newsroom_id, title, created_by) VALUES (:newsroom, :title, :reporter) RETURNING id', { newsroom: newsroom!.id, title, reporter: reporter!.id }))[0]!.id
  const investigationId = await investigation('Invoices that stop just short of a second signature')
  const blockIds: string[] = []
  for (const [position, part] of DEMO_STORY.entries()) {
    const [block] = await query<{ id: string }>(`INSERT INTO blocks (investigation_id, kind, position, content, settings, created_by) VALUES (:investigationId, :kind, :position, :content, :settings, :reporter) RETURNING id`, {
      investigationId, kind: part.kind, position, reporter: reporter!.id,
      content: part.kind === 'prose' ? JSON.stringify(part.content) : null,
      settings: part.kind === 'analysis' ? JSON.stringify(part.settings) : null,
    })
    blockIds.push(block!.id)
  }
  for (const [status, claim] of Object.entries(DEMO_CLAIMS)) {
    const at = DEMO_STORY.findIndex(part => part.kind === 'prose' && JSON.stringify(part.content).includes(claim.id))
    await query(`INSERT INTO claims (id, investigation_id, block_id, quote, supporting_block_ids, status, note, created_by, decided_by, decided_at)
      VALUES (:id, :investigationId, :blockId, :quote, ARRAY[:cites]::uuid[], :status, :note, :reporter, :decidedBy, :decidedAt)`, {
      id: claim.id, investigationId, blockId: blockIds[at], quote: `the passage of the ${status} claim`, cites: claim.cites.map(i => blockIds[i]),
      status, note: status === 'disputed' ? 'Say "stands out in the digit test".' : null, reporter: reporter!.id,
      decidedBy: status === 'open' ? null : checker!.id, decidedAt: status === 'open' ? null : new Date('2026-11-30T09:32:00Z'),
    })
  }
  return { investigationId, secondId: await investigation('A second draft of the same newsroom') }
}

beforeAll(async () => {
  database.recreate()
  owner = new Sequelize(database.url, { dialect: 'postgres', dialectModule: pg, logging: false })
  umzug = new Umzug({ migrations, context: owner, storage: new SequelizeStorage({ sequelize: owner, tableName: 'schema_migrations' }), logger: undefined })
  const before = migrations.filter(m => m.name < FIRST)
  await umzug.up({ to: before.at(-1)!.name })
}, 120_000)

afterAll(async () => {
  await owner?.close()
  database.recreate()
})

describe('migration 0100 on a database that holds the demo\'s claims', () => {
  it('keeps every claim as it was, keys claims by investigation and id, and lets another investigation use the same id', async () => {
    const { investigationId, secondId } = await writeDemo()
    const before = await claimRows()
    expect(before).toHaveLength(3)
    expect(await keyColumns()).toEqual(['id'])

    // The real path: the migration command `npm start` and `npm test` run, as the schema's owner.
    const printed = execFileSync(join(root, 'node_modules', '.bin', 'tsx'), ['server/cli/migrate.ts'], {
      cwd: root, encoding: 'utf8', env: { ...process.env, NUXT_DATABASE_OWNER_URL: database.url, NUXT_DATABASE_URL: database.appUrl },
    })
    expect(printed).toContain(FIRST)
    expect(await claimRows()).toEqual(before)
    expect(await keyColumns()).toEqual(['investigation_id', 'id'])

    const copy = (into: string) => query(`INSERT INTO claims (id, investigation_id, block_id, quote, created_by)
      SELECT id, :into, block_id, quote, created_by FROM claims WHERE id = :id`, { into, id: DEMO_CLAIMS.open.id })
    await copy(secondId)
    await expect(copy(investigationId)).rejects.toMatchObject({ name: 'SequelizeUniqueConstraintError', parent: { constraint: 'claims_pkey' } })
    expect(await query(`SELECT investigation_id FROM claims WHERE id = :id ORDER BY investigation_id`, { id: DEMO_CLAIMS.open.id })).toHaveLength(2)

    // Down refuses while two investigations share an id, and restores the old key once they do not.
    await expect(umzug.down({ migrations: [FIRST] })).rejects.toThrow()
    await query('DELETE FROM claims WHERE investigation_id = :secondId', { secondId })
    await umzug.down({ migrations: [FIRST] })
    expect(await keyColumns()).toEqual(['id'])
    expect(await claimRows()).toEqual(before)
  })
})
