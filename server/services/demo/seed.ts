import { Readable } from 'node:stream'
import { importDataset } from '../datasets/import'
import { runAnalysis } from '../investigations/analysis'
import { DEMO_NEWSROOM, DEMO_PASSWORD, DEMO_PEOPLE } from './people'
import { demoLedgerCsv } from './payments'
import { DEMO_STORY } from './story'

/** The people, in a transaction of their own so that a half-seeded newsroom never exists. */
async function seedPeople() {
  const { sequelize, models } = useDb()
  return sequelize.transaction(async (transaction) => {
    await sequelize.query('SELECT pg_advisory_xact_lock(4242001)', { transaction })
    if (await models.Newsroom.count({ transaction }) > 0) return null
    const newsroom = await models.Newsroom.create({ name: DEMO_NEWSROOM }, { transaction })
    const passwordHash = await hashPassword(DEMO_PASSWORD)
    const ids: Record<string, string> = {}
    for (const person of DEMO_PEOPLE) {
      const user = await models.User.create({ name: person.name, email: person.email, passwordHash }, { transaction })
      await models.Membership.create({ newsroomId: newsroom.id, userId: user.id, role: person.role }, { transaction })
      ids[person.role] = user.id
    }
    return { newsroomId: newsroom.id, reporterId: ids.reporter!, editorId: ids['data-editor']! }
  })
}

/** The invented ledger, imported through the same path as any upload. */
async function seedLedger(newsroomId: string, reporterId: string) {
  const bytes = Buffer.from(demoLedgerCsv())
  const stored = await useFileStore().save(Readable.from([bytes]), bytes.length)
  const dataset = await useDb().models.Dataset.create({
    newsroomId, title: 'Port Averly supplier payments, 2025', originalName: 'port-averly-payments-2025.csv', format: 'csv',
    sourceNote: 'Released by the (invented) Port Averly City Council finance office in response to an open-records request. Demo data: every name and figure is invented.',
    sourceUrl: null, obtainedOn: '2026-02-14', sha256: stored.sha256, byteSize: stored.byteSize, storageKey: stored.key,
    replacesId: null, createdBy: reporterId,
  })
  await importDataset(dataset.id)
  return dataset.id
}

async function seedStory(newsroomId: string, reporterId: string, datasetId: string) {
  const { models } = useDb()
  const investigation = await models.Investigation.create({ newsroomId, title: 'Invoices that stop just short of a second signature', createdBy: reporterId, updatedBy: reporterId })
  for (const [position, part] of DEMO_STORY.entries()) {
    const block = await models.Block.create({
      investigationId: investigation.id, kind: part.kind, position,
      content: part.kind === 'prose' ? part.content : null,
      settings: part.kind === 'analysis' ? { datasetId, ...part.settings } : null,
      createdBy: reporterId, updatedBy: reporterId,
    })
    if (block.kind === 'analysis') await runAnalysis(block, newsroomId)
  }
}

/**
 * Seeds the invented demo newsroom when the database holds no newsroom yet: its people, the
 * payments ledger with its planted anomaly, and a draft investigation with results computed.
 */
export async function seedDemoIfEmpty(): Promise<boolean> {
  const people = await seedPeople()
  if (!people) return false
  const datasetId = await seedLedger(people.newsroomId, people.reporterId)
  await seedStory(people.newsroomId, people.reporterId, datasetId)
  return true
}
