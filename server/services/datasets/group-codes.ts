/** More distinct values than this and a column is not coded: grouping by it falls back to a join. */
export const MAX_CODES = 100_000

/**
 * Gives each distinct (trimmed) text of a column a small integer, so digit records can carry
 * their row's text columns as codes. A column with too many distinct values stops being coded.
 */
export class GroupCodes {
  private readonly codes: (Map<string, number> | null)[]

  constructor(textPositions: boolean[]) {
    this.codes = textPositions.map(isText => (isText ? new Map() : null))
  }

  /** The row's codes as a PostgreSQL int[] literal, one per column (NULL for number columns). */
  literal(cells: readonly string[]): string {
    const parts: string[] = []
    for (let i = 0; i < this.codes.length; i++) {
      const map = this.codes[i]
      if (!map) {
        parts.push('NULL')
        continue
      }
      const text = cells[i]!.trim()
      let code = map.get(text)
      if (code === undefined) {
        if (map.size >= MAX_CODES) {
          this.codes[i] = null
          parts.push('NULL')
          continue
        }
        code = map.size + 1
        map.set(text, code)
      }
      parts.push(String(code))
    }
    return `"{${parts.join(',')}}"`
  }

  isCoded(position: number): boolean {
    return this.codes[position] !== null && this.codes[position] !== undefined
  }

  /** Dictionary rows for COPY: dataset_id, column_pos, code, value. */
  * dictionaryLines(datasetId: string): Generator<string> {
    for (const [position, map] of this.codes.entries()) {
      if (!map) continue
      for (const [value, code] of map) yield `${datasetId},${position},${code},"${value.replaceAll('\0', '').replaceAll('"', '""')}"\n`
    }
  }
}
