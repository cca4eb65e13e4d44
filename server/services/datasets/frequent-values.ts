/**
 * The most frequent value of a stream in bounded memory (Misra & Gries 1982, "Finding repeated
 * elements"): with k counters, every value that makes up more than 1/(k+1) of the stream is still
 * held at the end, and a held count falls short of the true count by at most the number of times
 * all counters were lowered together. The import keeps one per number column and sign; only when
 * that margin leaves the suitability check's 5% of repeated amounts in doubt does it count the
 * leading value exactly in SQL (grouping every distinct value instead takes seconds at a million rows).
 */
export const COUNTERS = 2000

export interface Leader {
  value: string
  /** How often the value was counted: its true count, or less by at most `slack`. */
  count: number
  slack: number
}

export class FrequentValues {
  private readonly counts = new Map<string, number>()
  private lowered = 0

  add(value: string) {
    const count = this.counts.get(value)
    if (count !== undefined) this.counts.set(value, count + 1)
    else if (this.counts.size < COUNTERS) this.counts.set(value, 1)
    else {
      // The new value and one of each held value cancel out; values that reach zero make room.
      this.lowered++
      for (const [held, n] of this.counts) {
        if (n === 1) this.counts.delete(held)
        else this.counts.set(held, n - 1)
      }
    }
  }

  /** The value held with the highest count, or null when nothing was added. */
  leader(): Leader | null {
    let best: Leader | null = null
    for (const [value, count] of this.counts) {
      if (!best || count > best.count) best = { value, count, slack: this.lowered }
    }
    return best
  }
}
