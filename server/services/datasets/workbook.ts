import { PassThrough } from 'node:stream'
import type { Readable } from 'node:stream'
import { StringDecoder } from 'node:string_decoder'
import { SaxesParser } from 'saxes'
import type { SaxesTagPlain } from 'saxes'
import type yauzl from 'yauzl'
import { decimalText, readNumber } from '#shared/digits'
import { UnreadableFile } from './sniff'
import { storable } from './storable-text'
import { ARCHIVE_ENTRIES, inflate, limited, openArchive } from './stored-archive'
import type { RangeOpener } from './stored-archive'

/**
 * Reads an .xlsx workbook (a zip of XML parts) with bounded memory, whatever the file claims.
 * A workbook is a zip archive, and a zip can inflate a few kilobytes into gigabytes (a "zip bomb"):
 * exceljs held shared strings and out-of-order parts in memory and took the whole server down.
 * Here every part is inflated as a stream, counted while it inflates and refused past its limit;
 * the central directory gives random access, so the shared strings are read before the sheet
 * whatever order the archive keeps them in.
 */

export type { RangeOpener }

/**
 * Each limit is one a workbook made by a spreadsheet program stays inside, so only a crafted or
 * broken file meets it. Excel's own limits ("Excel specifications and limits", Microsoft): 1,048,576
 * rows and 16,384 columns a sheet, 32,767 characters a cell.
 */
export const WORKBOOK_LIMITS = {
  entries: ARCHIVE_ENTRIES,
  rows: 1_048_576,
  columns: 16_384,
  /** Characters of one cell's text; the XML between two tags may be six times that (escapes). */
  cellCharacters: 32_767,
  /** Inflated bytes of the shared strings part, which is held in memory while the sheet is read. */
  sharedStringBytes: 64 * 1024 * 1024,
  sharedStrings: 2_000_000,
  /** Inflated bytes of each small part (workbook, relationships, styles). */
  smallPartBytes: 8 * 1024 * 1024,
  /** Inflated bytes of the sheet that is read, streamed and never held. */
  sheetBytes: 4 * 1024 * 1024 * 1024,
}

const DAMAGED = 'This workbook cannot be read: it is damaged, cut off, or not an Excel .xlsx file. Open it in the spreadsheet program and save it again as .xlsx, or export the sheet as CSV.'
const NO_SHEET = 'This .xlsx file holds no worksheet. Save the sheet with the data as .xlsx again, or export it as CSV.'

function tooBig(what: string): UnreadableFile {
  return new UnreadableFile(`This workbook's ${what} is larger than any spreadsheet program writes, so Mantissa does not read it (it may be a file made to exhaust the server). Export the sheet as CSV and upload that.`)
}

/** A tag as saxes gives it without namespaces: attributes are plain text. */
type Tag = SaxesTagPlain

type Handlers = {
  open?: (tag: Tag) => void
  close?: (name: string) => void
  text?: (text: string) => void
}

/** Feeds one part's XML to a parser chunk by chunk; `drain` runs after each chunk (the sheet hands its rows over there). */
async function* parsePart(stream: Readable, handlers: Handlers, drain?: () => unknown[]): AsyncGenerator<unknown[]> {
  const parser = new SaxesParser<{ position: false, xmlns: false }>({ position: false, xmlns: false })
  let failure: Error | null = null
  parser.on('error', (error) => {
    failure ??= error
  })
  if (handlers.open) parser.on('opentag', handlers.open)
  if (handlers.close) parser.on('closetag', tag => handlers.close!(tag.name))
  if (handlers.text) {
    parser.on('text', handlers.text)
    parser.on('cdata', handlers.text)
  }
  const decoder = new StringDecoder('utf8')
  try {
    for await (const chunk of stream) {
      parser.write(decoder.write(chunk as Buffer))
      if (failure) throw failure
      const ready = drain?.()
      if (ready?.length) yield ready
    }
    parser.write(decoder.end())
    parser.close()
    if (failure) throw failure
    const ready = drain?.()
    if (ready?.length) yield ready
  }
  finally {
    stream.destroy()
  }
}

async function consume(parts: AsyncGenerator<unknown[]>) {
  for await (const _ of parts) { /* the handlers keep what they need */ }
}

/** Local name of a tag: "x:row" and "row" are the same element (some writers prefix the namespace). */
const local = (name: string) => name.slice(name.indexOf(':') + 1)

/** A part's path from a relationship's target, relative to the part that names it. */
function resolvePath(from: string, target: string): string {
  if (target.startsWith('/')) return target.slice(1)
  const parts = from.split('/').slice(0, -1)
  for (const piece of target.split('/')) {
    if (piece === '..') parts.pop()
    else if (piece !== '.') parts.push(piece)
  }
  return parts.join('/')
}

function relsPath(part: string): string {
  const at = part.lastIndexOf('/')
  return `${part.slice(0, at + 1)}_rels/${part.slice(at + 1)}.rels`
}

/** The formats of number format ids 14–22 and 45–47, which Excel shows as dates and times (ECMA-376, 18.8.30). */
const BUILT_IN_DATE_FORMATS = new Set([14, 15, 16, 17, 18, 19, 20, 21, 22, 45, 46, 47])

/** A format code shows a date when, outside quoted text, escapes and [colour] sections, it has d, m, y, h or s. */
function isDateFormat(code: string): boolean {
  const bare = code.replace(/"[^"]*"/g, '').replace(/\\./g, '').replace(/\[[^\]]*\]/g, '')
  return /[dmyhs]/i.test(bare) && !/^general$/i.test(bare.trim())
}

/** A sheet as the workbook lists it. */
export interface SheetInfo {
  name: string
  hidden: boolean
}

interface Sheet extends SheetInfo {
  path: string
}

/** An open workbook: its sheets, and what reading one needs. */
class Workbook {
  private constructor(
    private readonly zip: yauzl.ZipFile,
    private readonly entries: Map<string, yauzl.Entry>,
    readonly sheets: Sheet[],
    private readonly date1904: boolean,
    private readonly sharedStringsPath: string | null,
    private readonly stylesPath: string | null,
  ) {}

  static async open(open: RangeOpener, size: number, counted: (bytes: number) => void): Promise<Workbook> {
    const { zip, entries } = await openArchive(open, size, counted, { damaged: DAMAGED, tooBig })
    try {
      return await Workbook.fromZip(zip, entries)
    }
    catch (error) {
      zip.close()
      throw error instanceof UnreadableFile ? error : new UnreadableFile(DAMAGED)
    }
  }

  private static async fromZip(zip: yauzl.ZipFile, entries: Map<string, yauzl.Entry>): Promise<Workbook> {
    const read = async (path: string) => (entries.has(path) ? await readSmall(zip, entries.get(path)!) : null)

    const rootRels = relationships(await read('_rels/.rels') ?? '', '')
    const workbookPath = rootRels.find(r => r.type.endsWith('/officeDocument'))?.target ?? 'xl/workbook.xml'
    const workbookXml = await read(workbookPath)
    if (workbookXml === null) throw new UnreadableFile(entries.size ? NO_SHEET : DAMAGED)
    const rels = relationships(await read(relsPath(workbookPath)) ?? '', workbookPath)
    const byId = new Map(rels.map(r => [r.id, r.target]))

    const sheets: Sheet[] = []
    let date1904 = false
    await consume(parsePart(readable(workbookXml), {
      open(tag) {
        const name = local(tag.name)
        if (name === 'workbookPr') date1904 = ['1', 'true'].includes(String(tag.attributes.date1904 ?? ''))
        if (name !== 'sheet') return
        const id = Object.entries(tag.attributes).find(([key]) => local(key) === 'id')?.[1]
        const path = id ? byId.get(String(id)) : undefined
        if (path) sheets.push({ name: String(tag.attributes.name ?? ''), hidden: ['hidden', 'veryHidden'].includes(String(tag.attributes.state ?? '')), path })
      },
    }))
    const present = sheets.filter(sheet => entries.has(sheet.path))
    if (!present.length) throw new UnreadableFile(NO_SHEET)
    const partOf = (type: string) => rels.find(r => r.type.endsWith(type))?.target ?? null
    return new Workbook(zip, entries, present, date1904, partOf('/sharedStrings'), partOf('/styles'))
  }

  close() {
    this.zip.close()
  }

  private stream(path: string, limit: number, what: string): Promise<Readable> {
    return inflatePart(this.zip, this.entries.get(path)!, limit, what)
  }

  /** The shared strings, which cells of type "s" point into; rich text runs are joined, phonetic guides left out. */
  async sharedStrings(): Promise<string[]> {
    const path = this.sharedStringsPath
    if (!path || !this.entries.has(path)) return []
    const strings: string[] = []
    let current: string[] | null = null
    let inText = false
    let phonetic = 0
    await consume(parsePart(await this.stream(path, WORKBOOK_LIMITS.sharedStringBytes, 'shared text'), {
      open(tag) {
        const name = local(tag.name)
        if (name === 'si') current = []
        else if (name === 'rPh') phonetic++
        else if (name === 't') inText = !tag.isSelfClosing && phonetic === 0
      },
      close(name) {
        name = local(name)
        if (name === 'si' && current) {
          if (strings.length === WORKBOOK_LIMITS.sharedStrings) throw tooBig('list of shared text')
          strings.push(current.join(''))
          current = null
        }
        else if (name === 'rPh') phonetic--
        else if (name === 't') inText = false
      },
      text(text) {
        if (inText && current) current.push(text)
      },
    }))
    return strings
  }

  /** Which cell styles show their number as a date, by style index. */
  async dateStyles(): Promise<boolean[]> {
    const path = this.stylesPath
    if (!path || !this.entries.has(path)) return []
    const formats = new Map<number, string>()
    const styles: boolean[] = []
    let inCellXfs = false
    await consume(parsePart(await this.stream(path, WORKBOOK_LIMITS.smallPartBytes, 'style list'), {
      open(tag) {
        const name = local(tag.name)
        if (name === 'numFmt') formats.set(Number(tag.attributes.numFmtId), String(tag.attributes.formatCode ?? ''))
        else if (name === 'cellXfs') inCellXfs = !tag.isSelfClosing
        else if (name === 'xf' && inCellXfs) {
          const id = Number(tag.attributes.numFmtId ?? 0)
          const code = formats.get(id)
          styles.push(code === undefined ? BUILT_IN_DATE_FORMATS.has(id) : isDateFormat(code))
        }
      },
      close(name) {
        if (local(name) === 'cellXfs') inCellXfs = false
      },
    }))
    return styles
  }

  /** The rows of one sheet as text cells, as a spreadsheet shows them; streamed, a batch per inflated chunk. */
  async* rows(sheet: Sheet): AsyncGenerator<string[][]> {
    const [strings, dates] = [await this.sharedStrings(), await this.dateStyles()]
    const date1904 = this.date1904
    const ready: string[][] = []
    let row: string[] | null = null
    let rowCount = 0
    let cell: { column: number, type: string, style: number, value: string, formula: string | null, inline: string } | null = null
    let capture: 'value' | 'formula' | 'inline' | null = null
    let phonetic = 0
    let nextColumn = 0

    const finishCell = () => {
      if (!row || !cell) return
      while (row.length < cell.column) row.push('')
      row[cell.column] = storable(cellText(cell, strings, dates, date1904))
      nextColumn = cell.column + 1
      cell = null
    }

    yield* parsePart(await this.stream(sheet.path, WORKBOOK_LIMITS.sheetBytes, 'sheet'), {
      open(tag) {
        const name = local(tag.name)
        if (name === 'row') {
          if (++rowCount > WORKBOOK_LIMITS.rows) throw tooBig('number of rows')
          row = []
          nextColumn = 0
          if (tag.isSelfClosing) {
            ready.push(row)
            row = null
          }
        }
        else if (name === 'c' && row) {
          const ref = String(tag.attributes.r ?? '')
          const column = ref ? columnIndex(ref) : nextColumn
          if (column >= WORKBOOK_LIMITS.columns) throw tooBig('number of columns')
          cell = { column, type: String(tag.attributes.t ?? 'n'), style: Number(tag.attributes.s ?? 0), value: '', formula: null, inline: '' }
          if (tag.isSelfClosing) finishCell()
        }
        else if (cell) {
          if (name === 'v') capture = 'value'
          else if (name === 'f') {
            cell.formula ??= ''
            capture = 'formula'
          }
          else if (name === 'rPh') phonetic++
          else if (name === 't' && phonetic === 0) capture = 'inline'
        }
      },
      close(name) {
        name = local(name)
        if (name === 'c') finishCell()
        else if (name === 'row' && row) {
          finishCell()
          ready.push(row)
          row = null
        }
        else if (name === 'rPh') phonetic--
        else if (name === 'v' || name === 'f' || name === 't') capture = null
      },
      text(text) {
        if (!cell || !capture) return
        if (capture === 'value') cell.value += text
        else if (capture === 'formula') cell.formula += text
        else cell.inline += text
        if (cell.value.length + cell.inline.length > WORKBOOK_LIMITS.cellCharacters * 2) throw tooBig('cell text')
      },
    }, () => ready.splice(0)) as AsyncGenerator<string[][]>
  }
}

/** "AB12" → 27 (columns from 0). */
function columnIndex(ref: string): number {
  let column = 0
  for (let i = 0; i < ref.length; i++) {
    const code = ref.charCodeAt(i) | 0x20
    if (code < 0x61 || code > 0x7A) break
    column = column * 26 + (code - 0x60)
    if (column > WORKBOOK_LIMITS.columns) break
  }
  return column - 1
}

/**
 * Excel works to 15 significant digits and shows no more; the 17 a workbook stores are binary
 * leftovers of its arithmetic (1.1 * 100 is kept as 110.00000000000001), not the figure.
 */
const EXCEL_DIGITS = 15

/** A number's plain decimal text: String(1e21) would give "1e+21". */
function numberText(value: number): string {
  const read = readNumber(value)
  return read.status === 'number' || read.status === 'zero' ? decimalText(read) : String(value)
}

/** Excel's serial day number as a date (1900 or 1904 system), shown without a time when it has none. */
function dateText(serial: number, date1904: boolean): string {
  const date = new Date(Math.round((serial - 25569 + (date1904 ? 1462 : 0)) * 86_400_000))
  return Number.isNaN(date.getTime()) ? String(serial) : date.toISOString().replace(/T00:00:00\.000Z$/, '')
}

/** A cell's text as the spreadsheet shows it: the saved value of a formula, an error as its code, TRUE/FALSE. */
function cellText(cell: { type: string, style: number, value: string, formula: string | null, inline: string }, strings: string[], dates: boolean[], date1904: boolean): string {
  const { type, value } = cell
  // A formula whose value was never saved (scripts write such workbooks): shown as the formula, so
  // the cell counts as unreadable instead of passing for a blank.
  if (value === '' && type !== 'inlineStr' && cell.formula) return `=${cell.formula}`
  switch (type) {
    case 's': return strings[Number(value)] ?? ''
    case 'inlineStr': return cell.inline
    case 'b': return value === '1' || value.toLowerCase() === 'true' ? 'TRUE' : 'FALSE'
    case 'e': case 'str': return value
    case 'd': return value.replace(/T00:00:00(\.0+)?Z?$/, '')
    default: {
      if (value === '') return ''
      const number = Number(value)
      if (!Number.isFinite(number)) return value
      if (dates[cell.style]) return dateText(number, date1904)
      return numberText(Number(number.toPrecision(EXCEL_DIGITS)))
    }
  }
}

function readable(text: string): Readable {
  const stream = new PassThrough()
  stream.end(Buffer.from(text, 'utf8'))
  return stream
}

/** A part of the workbook, refused past `limit` and when one run of text is longer than a cell can hold. */
async function inflatePart(zip: yauzl.ZipFile, entry: yauzl.Entry, limit: number, what: string): Promise<Readable> {
  if (entry.uncompressedSize > limit) throw tooBig(what)
  const gap = { bytes: WORKBOOK_LIMITS.cellCharacters * 6 + 4096, refuse: () => tooBig('cell text') }
  return inflate(zip, entry, limited(limit, () => tooBig(what), gap), DAMAGED)
}

async function readSmall(zip: yauzl.ZipFile, entry: yauzl.Entry): Promise<string> {
  const chunks: Buffer[] = []
  try {
    for await (const chunk of await inflatePart(zip, entry, WORKBOOK_LIMITS.smallPartBytes, 'workbook description')) chunks.push(chunk as Buffer)
  }
  catch (error) {
    if (error instanceof UnreadableFile) throw error
    throw new UnreadableFile(DAMAGED)
  }
  return Buffer.concat(chunks).toString('utf8')
}

function relationships(xml: string, from: string): { id: string, type: string, target: string }[] {
  const found: { id: string, type: string, target: string }[] = []
  if (!xml) return found
  const parser = new SaxesParser<{ position: false, xmlns: false }>({ position: false, xmlns: false })
  parser.on('error', () => {})
  parser.on('opentag', (tag) => {
    if (local(tag.name) !== 'Relationship' || tag.attributes.TargetMode === 'External') return
    found.push({ id: String(tag.attributes.Id ?? ''), type: String(tag.attributes.Type ?? ''), target: resolvePath(from, String(tag.attributes.Target ?? '')) })
  })
  try {
    parser.write(xml).close()
  }
  catch { /* a broken list of relationships names fewer parts; what is missing is reported below */ }
  return found
}

/**
 * The rows of a workbook's sheet (the first visible one unless `sheetName` names another), header
 * first, in batches. Every failure is an UnreadableFile with a reason a reporter can act on.
 */
export async function* workbookRows(open: RangeOpener, size: number, sheetName: string | null, counted: (bytes: number) => void, listed: (sheets: string[]) => void = () => {}): AsyncGenerator<string[][]> {
  const workbook = await Workbook.open(open, size, counted)
  listed(workbook.sheets.map(sheet => sheet.name))
  try {
    const sheet = sheetName === null
      ? workbook.sheets.find(s => !s.hidden) ?? workbook.sheets[0]!
      : workbook.sheets.find(s => s.name === sheetName)
    if (!sheet) throw new UnreadableFile(`This workbook has no sheet named "${sheetName}". Its sheets: ${workbook.sheets.map(s => `"${s.name}"`).join(', ')}.`)
    yield* workbook.rows(sheet)
  }
  catch (error) {
    if (error instanceof UnreadableFile) throw error
    throw new UnreadableFile(DAMAGED)
  }
  finally {
    workbook.close()
  }
}

/** The sheets a workbook lists, in its order (for choosing one). */
export async function workbookSheets(open: RangeOpener, size: number): Promise<SheetInfo[]> {
  const workbook = await Workbook.open(open, size, () => {})
  workbook.close()
  return workbook.sheets.map(({ name, hidden }) => ({ name, hidden }))
}
