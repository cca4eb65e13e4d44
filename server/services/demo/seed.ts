import { Readable } from 'node:stream'
import { importDataset } from '../datasets/import'
import { runAnalysis } from '../investigations/analysis'
import { DEMO_NEWSROOM, DEMO_PASSWORD, DEMO_PEOPLE } from './people'
import { demoLedgerCsv } from './payments'
import { DEMO_CLAIMS, DEMO_FOLLOW_UP, DEMO_STORY } from './story'
import { decideReview, requestReview } from '../investigations/review'
import { claimOf, createClaim, disputeClaim, verifyClaim } from '../investigations/claims'
import { publish } from '../publishing/publish'
import { replyToThread } from '../conversation/threads'
import { recordBlockVersion } from '../history/versions'
import type { Actor } from '../../utils/permissions'
import type { Block } from '../../models'

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
    return { newsroomId: newsroom.id, reporterId: ids.reporter!, editorId: ids['data-editor']!, checkerId: ids['fact-checker']! }
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

interface DemoPeople { newsroomId: string, reporterId: string, editorId: string, checkerId: string }

function actorOf(people: DemoPeople, userId: string, role: Actor['role']): Actor {
  const person = DEMO_PEOPLE.find(p => p.role === role)!
  return { userId, name: person.name, email: person.email, newsroomId: people.newsroomId, role, secondFactor: false }
}

/** The draft with its blocks run, a claim in each state, reviews in each state, a published version, and work since, back in review. */
async function seedStory(people: DemoPeople, datasetId: string) {
  const { models } = useDb()
  const { newsroomId, reporterId } = people
  const investigation = await models.Investigation.create({ newsroomId, title: 'Invoices that stop just short of a second signature', createdBy: reporterId, updatedBy: reporterId, status: 'in-review' })
  const blocks: Block[] = []
  for (const [position, part] of DEMO_STORY.entries()) {
    const block = await models.Block.create({
      investigationId: investigation.id, kind: part.kind, position,
      content: part.kind === 'prose' ? part.content : null,
      settings: part.kind === 'analysis' ? { datasetId, ...part.settings } : null,
      createdBy: reporterId, updatedBy: reporterId,
    })
    await recordBlockVersion(block, 'created')
    if (block.kind === 'analysis') await runAnalysis(block, newsroomId)
    blocks.push(block)
  }
  const reporter = actorOf(people, reporterId, 'reporter')
  const editor = actorOf(people, people.editorId, 'data-editor')
  const checker = actorOf(people, people.checkerId, 'fact-checker')
  for (const [index, decision] of [[1, 'approved'], [3, 'approved'], [5, 'sent-back']] as const) {
    await decideReview(editor, blocks[index]!, investigation, decision, decision === 'approved' ? undefined : 'Give the band width in the text and show how many payments fall just over the limit, not only under it.')
  }
  const claimIn = (id: string) => blocks.find(b => b.kind === 'prose' && JSON.stringify(b.content).includes(id))!
  for (const claim of Object.values(DEMO_CLAIMS)) {
    await createClaim(reporter, investigation, { id: claim.id, blockId: claimIn(claim.id).id, supportingBlockIds: claim.cites.map(i => blocks[i]!.id) })
  }
  const verified = await claimOf(investigation.id, DEMO_CLAIMS.verified.id)
  await verifyClaim(checker, verified, { quote: verified.quote })
  const disputed = await claimOf(investigation.id, DEMO_CLAIMS.disputed.id)
  await disputeClaim(checker, disputed, investigation, 'The ranking shows a deviation, not that the supplier is unusual in any other way. Say "stands out in the digit test".')
  // The reporter answers the dispute in its conversation and asks the data editor in, so the demo shows one.
  const dispute = await models.Thread.findOne({ where: { investigationId: investigation.id, subjectType: 'claim', subjectId: disputed.id } })
  if (dispute) {
    await replyToThread(reporter, investigation, dispute, [
      { type: 'text', text: 'Fair: I will say it stands out in the digit test and nothing more. ' },
      { type: 'mention', userId: people.editorId },
      { type: 'text', text: ' could you look at the ranking\'s method before I reword it?' },
    ])
  }
  const published = await publish(editor, investigation, {
    reason: 'Demo newsroom: published with checks still open, to show the public page.',
    disputed: { claimIds: [DEMO_CLAIMS.disputed.id], reason: 'Demo newsroom: the disputed passage is published to show that the public page does not mark it as verified.' },
  })
  await recordBlockVersion(await models.Block.create({
    investigationId: investigation.id, kind: 'prose', position: blocks.length, content: DEMO_FOLLOW_UP, createdBy: reporterId, updatedBy: reporterId,
  }), 'created')
  await requestReview(reporter, investigation)
  return published.url
}

/**
 * Seeds the invented demo newsroom when the database holds no newsroom yet: its people, the
 * payments ledger with its planted anomaly, and an investigation in review with a published
 * version. Answers the public link, or null when the database was not empty.
 */
export async function seedDemoIfEmpty(): Promise<string | null> {
  const people = await seedPeople()
  if (!people) return null
  const datasetId = await seedLedger(people.newsroomId, people.reporterId)
  return seedStory(people, datasetId)
}
