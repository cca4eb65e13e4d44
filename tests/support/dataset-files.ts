import { once } from 'node:events'
import { createWriteStream } from 'node:fs'
import ExcelJS from 'exceljs'

/** A dataset as the cells a person would see in a spreadsheet: a header and rows of text. */
export interface Table {
  header: string[]
  rows: string[][]
}

function quoteCell(cell: string, delimiter: string): string {
  return cell.includes(delimiter) || /["\r\n]/.test(cell) ? `"${cell.replaceAll('"', '""')}"` : cell
}

/** RFC 4180 text: cells quoted only when they must be, CRLF line ends, a final line end. */
export function delimitedText(table: Table, delimiter = ','): string {
  return [table.header, ...table.rows].map(row => row.map(cell => quoteCell(cell, delimiter)).join(delimiter)).join('\r\n') + '\r\n'
}

export const utf8 = (text: string) => new TextEncoder().encode(text)

const PLAIN_NUMBER = /^-?\d+(\.\d+)?$/
const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/

/** A cell as a JSON file or a workbook would hold it: plain numbers as numbers, blanks as nothing. */
function typedCell(cell: string): string | number | null {
  if (cell === '') return null
  return PLAIN_NUMBER.test(cell) ? Number(cell) : cell
}

/** A JSON array of records, one object per row, keys in header order. */
export function jsonRecords(table: Table): string {
  return JSON.stringify(table.rows.map(row => Object.fromEntries(table.header.map((name, i) => [name, typedCell(row[i]!)]))), null, 1)
}

/** An .xlsx workbook with one sheet: numbers as numbers, ISO dates as date cells, blanks left empty. */
export async function workbookBytes(table: Table): Promise<Uint8Array> {
  const workbook = new ExcelJS.Workbook()
  const sheet = workbook.addWorksheet('Data')
  sheet.addRow(table.header)
  for (const row of table.rows) {
    sheet.addRow(row.map((cell) => {
      if (ISO_DATE.test(cell)) return new Date(`${cell}T00:00:00Z`)
      return typedCell(cell)
    }))
  }
  return new Uint8Array(await workbook.xlsx.writeBuffer())
}

/** Text in each encoding the importer promises to read, with the byte-order mark where it has one. */
export function encoded(text: string, encoding: 'utf-8' | 'utf-8-bom' | 'utf-16le' | 'utf-16be' | 'latin-1'): Uint8Array {
  switch (encoding) {
    case 'utf-8': return Buffer.from(text, 'utf8')
    case 'utf-8-bom': return Buffer.concat([Buffer.from([0xEF, 0xBB, 0xBF]), Buffer.from(text, 'utf8')])
    case 'utf-16le': return Buffer.from(`\uFEFF${text}`, 'utf16le')
    case 'utf-16be': return Buffer.from(`\uFEFF${text}`, 'utf16le').swap16()
    case 'latin-1': {
      if ([...text].some(ch => ch.codePointAt(0)! > 0xFF)) throw new Error('text has characters outside Latin-1')
      return Buffer.from(text, 'latin1')
    }
  }
}

/**
 * Streams a CSV of at least `minBytes` to `path` without holding it in memory: the header, then
 * `rowOf(1)`, `rowOf(2)`, … and finally `tail` (e.g. a row that breaks the file). Returns the row count.
 */
export async function writeLargeCsv(path: string, header: string[], rowOf: (n: number) => string[], minBytes: number, tail = ''): Promise<number> {
  const out = createWriteStream(path)
  let bytes = 0
  let rows = 0
  const write = async (text: string) => {
    bytes += Buffer.byteLength(text)
    if (!out.write(text)) await once(out, 'drain')
  }
  await write(`${header.join(',')}\r\n`)
  while (bytes < minBytes) {
    let chunk = ''
    while (chunk.length < 1 << 16 && bytes + chunk.length < minBytes) chunk += `${rowOf(++rows).join(',')}\r\n`
    await write(chunk)
  }
  await write(tail)
  out.end()
  await once(out, 'finish')
  return rows
}
