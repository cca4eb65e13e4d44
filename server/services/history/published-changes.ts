import { Op } from 'sequelize'
import { diffArrays } from 'diff'
import type { PublicationChangesDTO, PublishedChangeDTO } from '#shared/types/history'
import type { AnalysisSettings, ProseContent } from '#shared/types/investigation'
import type { PublishedBlock } from '#shared/types/publication'
import type { Block, Publication } from '../../models'
import { liveBlocks } from '../investigations/catalog'
import { placeLabels } from './places'
import { stateDiff } from './versions'
import { blockLabel } from '#shared/history/block-label'
import { proseText } from '#shared/history/prose-text'

interface State { kind: 'prose' | 'analysis', content: ProseContent | null, settings: AnalysisSettings | null }

const stateOfPublished = (b: PublishedBlock): State => (b.kind === 'prose'
  ? { kind: 'prose', content: b.content, settings: null }
  : { kind: 'analysis', content: null, settings: b.settings })

/** What a reader sees of a state: the words of a text (claim marks are not drawn for unverified claims), the settings of an analysis. */
const readingOf = (s: State) => (s.kind === 'prose' ? `p:${proseText(s.content)}` : `a:${canonicalJson(s.settings ?? {})}`)

/**
 * What changed in the draft since a publication, block by block: blocks added since, blocks the
 * publication had that are gone from the draft, and blocks whose text or settings differ (with the
 * difference). A publication names the versions it froze, so blocks are matched by id; one made
 * before Mantissa kept versions is matched by content and order (`matchedBy: 'content'`).
 */
export async function changesSincePublication(publication: Publication): Promise<PublicationChangesDTO> {
  const live = await liveBlocks(publication.investigationId)
  const base = { publicationId: publication.id, publishedAt: publication.publishedAt.toISOString() }
  if (publication.blockVersions) return { ...base, matchedBy: 'version', ...await byVersion(publication, live) }
  return { ...base, matchedBy: 'content', ...await byContent(publication, live) }
}

async function byVersion(publication: Publication, live: Block[]) {
  const frozen = publication.blockVersions!
  const { models } = useDb()
  const rows = frozen.length
    ? await models.BlockVersion.findAll({ where: { [Op.or]: frozen.map(f => ({ blockId: f.blockId, version: f.version })) } })
    : []
  const published = new Map(rows.map(r => [r.blockId, r]))
  const liveIds = new Set(live.map(b => b.id))
  const gone = frozen.some(f => !liveIds.has(f.blockId))
    ? await models.Block.findAll({ where: { id: frozen.filter(f => !liveIds.has(f.blockId)).map(f => f.blockId) } })
    : []
  const labels = await placeLabels(publication.investigationId, [...live, ...gone])
  const changes: PublishedChangeDTO[] = []
  let unchanged = 0
  for (const block of live) {
    const then = published.get(block.id)
    if (!then) {
      changes.push({ blockId: block.id, label: labels.get(block.id)!, change: 'added', diff: null })
      continue
    }
    const diff = await stateDiff(then, block)
    if (diff.changed) changes.push({ blockId: block.id, label: labels.get(block.id)!, change: 'changed', diff })
    else unchanged++
  }
  for (const block of gone) {
    const then = published.get(block.id)
    changes.push({ blockId: block.id, label: then ? blockLabel(then, null) : labels.get(block.id)!, change: 'removed', diff: null })
  }
  return { changes, unchanged }
}

/**
 * Older publications keep the blocks' contents without their ids: the published and the current
 * blocks are lined up by what they read (the `diff` package's array comparison), and a published
 * block that is followed by a current one of the same kind in its place counts as changed.
 */
async function byContent(publication: Publication, live: Block[]) {
  const then = publication.snapshot.blocks.map(stateOfPublished)
  const labels = await placeLabels(publication.investigationId, live)
  const parts = diffArrays(then.map(readingOf), live.map(b => readingOf(b)))
  const changes: PublishedChangeDTO[] = []
  let unchanged = 0
  let [i, j] = [0, 0]
  for (let k = 0; k < parts.length; k++) {
    const part = parts[k]!
    if (!part.added && !part.removed) {
      unchanged += part.count
      i += part.count
      j += part.count
      continue
    }
    if (part.removed) {
      const next = parts[k + 1]
      const paired = next?.added ? Math.min(part.count, next.count) : 0
      for (let n = 0; n < part.count; n++) {
        const old = then[i + n]!
        const now = n < paired ? live[j + n]! : null
        if (now && now.kind === old.kind) changes.push({ blockId: now.id, label: labels.get(now.id)!, change: 'changed', diff: await stateDiff(old, now) })
        else {
          changes.push({ blockId: null, label: blockLabel(old, null), change: 'removed', diff: null })
          if (now) changes.push({ blockId: now.id, label: labels.get(now.id)!, change: 'added', diff: null })
        }
      }
      i += part.count
      if (next?.added) {
        for (let n = paired; n < next.count; n++) changes.push({ blockId: live[j + n]!.id, label: labels.get(live[j + n]!.id)!, change: 'added', diff: null })
        j += next.count
        k++
      }
      continue
    }
    for (let n = 0; n < part.count; n++) changes.push({ blockId: live[j + n]!.id, label: labels.get(live[j + n]!.id)!, change: 'added', diff: null })
    j += part.count
  }
  return { changes, unchanged }
}
