/**
 * The most frequent value of a stream in bounded memory (Misra & Gries 1982, "Finding repeated
 * elements"): with k counters, every value that makes up more than 1/(k+1) of the stream is still
 * held at the end. The import keeps one per number column and sign and then counts the leading
 * candidate exactly in SQL, instead of grouping every distinct value of the column (seconds at a
 * million rows). The count it stores is therefore exact for any value above 1/(k+1) of the column,
 * far below the 5% at which the suitability check speaks of repeated amounts.
 */
export const COUNTERS = 2000

export class FrequentValues {
  private readonly counts = new Map<string, number>()

  add(value: string) {
    const count = this.counts.get(value)
    if (count !== undefined) this.counts.set(value, count + 1)
    else if (this.counts.size < COUNTERS) this.counts.set(value, 1)
    else {
      // The new value and one of each held value cancel out; values that reach zero make room.
      for (const [held, n] of this.counts) {
        if (n === 1) this.counts.delete(held)
        else this.counts.set(held, n - 1)
      }
    }
  }

  /** The value held with the highest count, or null when nothing was added. */
  leader(): string | null {
    let best: string | null = null
    let most = 0
    for (const [value, n] of this.counts) {
      if (n > most) {
        best = value
        most = n
      }
    }
    return best
  }
}
