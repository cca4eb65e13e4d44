import type { Transaction } from 'sequelize'
import { blockGist } from '#shared/history/block-label'
import { proseText } from '#shared/history/prose-text'
import { settingsDiff } from '#shared/history/settings-diff'
import { textDiff } from '#shared/history/text-diff'
import type { BlockDiffDTO, BlockHistoryDTO, BlockVersionChange, BlockVersionDTO, BlockVersionSummaryDTO, StateDiff } from '#shared/types/history'
import type { AnalysisSettings, ProseContent } from '#shared/types/investigation'
import type { Block, BlockVersion } from '../../models'
import { userNames } from '../investigations/catalog'
import { placeLabels } from './places'

/**
 * Appends the block's state as it now stands (its version, text or settings, who saved it) to its
 * history, inside the save's own transaction: a save that rolls back leaves no version, and the
 * block's row lock, held by every save, keeps versions in the order they were saved.
 */
export async function recordBlockVersion(block: Block, change: BlockVersionChange, transaction?: Transaction, restoredFrom: number | null = null) {
  await useDb().models.BlockVersion.create({
    blockId: block.id, investigationId: block.investigationId, version: block.version, kind: block.kind,
    content: block.kind === 'prose' ? block.content : null, settings: block.kind === 'analysis' ? block.settings : null,
    change, restoredFrom, savedBy: block.updatedBy ?? block.createdBy,
  }, { transaction })
}

function summaryOf(row: BlockVersion, names: Map<string, string>): BlockVersionSummaryDTO {
  return {
    version: row.version, change: row.change, restoredFrom: row.restoredFrom ?? null,
    savedBy: row.savedBy ? names.get(row.savedBy) ?? 'a former member' : null, savedAt: row.savedAt.toISOString(),
    summary: blockGist(row),
  }
}

/** Every kept version of a block, newest first, with its place in the document. */
export async function blockHistory(block: Block): Promise<BlockHistoryDTO> {
  const rows = await useDb().models.BlockVersion.findAll({ where: { blockId: block.id }, order: [['version', 'DESC']] })
  const names = await userNames(rows.map(r => r.savedBy))
  const labels = await placeLabels(block.investigationId, [block])
  return {
    blockId: block.id, investigationId: block.investigationId, kind: block.kind, label: labels.get(block.id)!,
    removed: Boolean(block.deletedAt), version: block.version, versions: rows.map(row => summaryOf(row, names)),
  }
}

async function versionRow(block: Block, version: number, transaction?: Transaction): Promise<BlockVersion> {
  const row = await useDb().models.BlockVersion.findOne({ where: { blockId: block.id, version }, transaction })
  if (!row) throw fail(404, { message: `This block has no version ${version}.` })
  return row
}

/** One version as the history lists it. */
export async function versionSummary(block: Block, version: number): Promise<BlockVersionSummaryDTO> {
  const row = await versionRow(block, version)
  return summaryOf(row, await userNames([row.savedBy]))
}

/** One version in full: its text or settings. */
export async function blockVersion(block: Block, version: number): Promise<BlockVersionDTO> {
  const row = await versionRow(block, version)
  const names = await userNames([row.savedBy])
  return { ...summaryOf(row, names), kind: row.kind, content: row.content, settings: row.settings }
}

/** Dataset titles by id, for settings in words. */
export async function datasetTitles(settings: (AnalysisSettings | null | undefined)[]): Promise<Map<string, string>> {
  const ids = [...new Set(settings.map(s => s?.datasetId).filter((id): id is string => Boolean(id)))]
  if (!ids.length) return new Map()
  const rows = await useDb().models.Dataset.findAll({ where: { id: ids }, attributes: ['id', 'title'] })
  return new Map(rows.map(d => [d.id, d.title]))
}

interface BlockState { kind: 'prose' | 'analysis', content: ProseContent | null, settings: AnalysisSettings | null }

/** What differs between two states of one block: the words of a text, or every setting side by side. */
export async function stateDiff(before: BlockState, after: BlockState): Promise<StateDiff> {
  if (after.kind === 'analysis') {
    const settings = settingsDiff(before.settings, after.settings, await datasetTitles([before.settings, after.settings]))
    return { kind: 'analysis', changed: settings.some(s => s.changed), text: null, sameWords: true, settings }
  }
  const [a, b] = [proseText(before.content), proseText(after.content)]
  const sameWords = a === b
  const changed = !sameWords || canonicalJson(before.content) !== canonicalJson(after.content)
  return { kind: 'prose', changed, text: textDiff(a, b), sameWords, settings: null }
}

/** The difference from one version of a block to another (either may be the earlier). */
export async function versionDiff(block: Block, from: number, to: number): Promise<BlockDiffDTO> {
  const [a, b] = await Promise.all([versionRow(block, from), versionRow(block, to)])
  const names = await userNames([a.savedBy, b.savedBy])
  return { ...await stateDiff(a, b), from: summaryOf(a, names), to: summaryOf(b, names) }
}
