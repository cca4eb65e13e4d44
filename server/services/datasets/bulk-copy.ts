import { finished } from 'node:stream/promises'
import type { PoolClient } from 'pg'
import { from as copyFrom } from 'pg-copy-streams'

const IN_FLIGHT_BYTES = 8 << 20

/**
 * A new table filled by COPY … FROM STDIN in PostgreSQL's binary format, from bytes a CopyEncoder
 * wrote, with backpressure. The table is created in the COPY's own transaction, so its rows are
 * written frozen (no later scan has to set their hint bits), the server skips the write-ahead log
 * for it (wal_level minimal), and an abandoned import leaves no table behind.
 */
export class CopyStream {
  private readonly stream
  // A write that fails (the connection died) is kept here and thrown by the next send, instead
  // of escaping as an unhandled 'error' event and leaving the import waiting for a 'drain'.
  private failure: Error | null = null

  private constructor(private readonly client: PoolClient, table: string, columns: string[]) {
    this.stream = client.query(copyFrom(`COPY ${table} (${columns.join(', ')}) FROM STDIN WITH (FORMAT binary, FREEZE)`))
    this.stream.on('error', (error: Error) => {
      this.failure ??= error
    })
  }

  /** Creates `table` like `parent`, runs `setup` on it (constraints, indexes) and starts copying into it. */
  static async open(client: PoolClient, table: string, parent: string, columns: string[], setup = ''): Promise<CopyStream> {
    await client.query(`BEGIN; CREATE TABLE ${table} (LIKE ${parent}); ${setup}`)
    return new CopyStream(client, table, columns)
  }

  /**
   * Resolves on `event`; rejects when the stream fails or closes first, so a dead connection never
   * leaves it waiting. pg-copy-streams reports a lost connection by emitting 'error' without
   * destroying the stream, so no 'close' follows: the error itself must end the wait.
   */
  private until(event: 'drain' | 'finish'): Promise<void> {
    return new Promise((resolve, reject) => {
      const settle = (error?: Error) => {
        this.stream.off(event, onEvent)
        this.stream.off('close', onClose)
        this.stream.off('error', onClose)
        if (error) reject(error)
        else resolve()
      }
      const onEvent = () => settle()
      const onClose = (error?: Error) => settle(this.failure ?? error ?? new Error('The connection to the database closed during a COPY.'))
      this.stream.on(event, onEvent)
      this.stream.on('close', onClose)
      this.stream.on('error', onClose)
      if (this.failure || this.stream.destroyed) onClose()
    })
  }

  /** Sends encoded bytes, waiting when PostgreSQL falls behind. */
  async send(chunks: readonly Uint8Array[]) {
    if (this.failure) throw this.failure
    for (const chunk of chunks) this.stream.write(chunk)
    // Waiting for every chunk to drain would leave the encoder and PostgreSQL taking turns; a few
    // megabytes in flight keep both busy while memory stays bounded.
    if (this.stream.writableLength > IN_FLIGHT_BYTES) await this.until('drain')
  }

  /** Sends the last bytes (the encoder's end()), finishes the COPY and commits the table. */
  async end(last: readonly Uint8Array[]) {
    await this.send(last)
    const done = this.until('finish')
    this.stream.end()
    await done
    await this.client.query('COMMIT')
  }

  /**
   * Abandons the COPY and with it the table: PostgreSQL answers the cut-off COPY with an error,
   * which is expected here and must not escape as an unhandled 'error' event.
   */
  async abort() {
    const closed = finished(this.stream).catch(() => {})
    this.stream.destroy()
    await closed
    await this.client.query('ROLLBACK').catch(() => {})
  }
}
