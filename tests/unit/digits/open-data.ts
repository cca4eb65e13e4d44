import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import path from 'node:path'
import Papa from 'papaparse'

// vega-datasets 3.2.1 (BSD-3-Clause) carries the files; its JS API would fetch them from a CDN.
const dataFolder = path.join(path.dirname(createRequire(import.meta.url).resolve('vega-datasets')), '..', 'data')

export function jsonColumn(file: string, column: string): unknown[] {
  const rows = JSON.parse(readFileSync(path.join(dataFolder, file), 'utf8')) as Array<Record<string, unknown>>
  return rows.map(row => row[column])
}

/** Column cells as text, exactly as written in the CSV. */
export function csvColumn(file: string, column: string): string[] {
  const parsed = Papa.parse<Record<string, string>>(readFileSync(path.join(dataFolder, file), 'utf8'), { header: true, skipEmptyLines: true })
  return parsed.data.map(row => row[column]!)
}
