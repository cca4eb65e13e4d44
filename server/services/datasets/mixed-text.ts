// Text that is UTF-8 in one part and Windows-1252 (Latin-1) in another: a file appended to from two
// systems. Each byte sequence is read as what it is: valid UTF-8 as UTF-8, any other byte as the
// Windows-1252 character it stands for. Plain TypeScript, no I/O.

// Streaming on purpose: Node 20's one-shot decode of windows-1252 reads 0x80-0x9F as ISO-8859-1
// (0x80 became U+0080, not the euro sign), its streaming decode by the standard's table.
const SINGLE = Array.from({ length: 256 }, (_, byte) => new TextDecoder('windows-1252').decode(Uint8Array.of(byte), { stream: true }))

/**
 * The length of the UTF-8 character starting at `at` (RFC 3629: no overlong forms, no surrogates,
 * nothing past U+10FFFF); 0 when the bytes there are not one, -1 when `bytes` ends inside it.
 */
function characterAt(bytes: Uint8Array, at: number): number {
  const lead = bytes[at]!
  if (lead < 0x80) return 1
  let length: number
  let low = 0x80
  let high = 0xBF
  if (lead >= 0xC2 && lead <= 0xDF) length = 2
  else if (lead >= 0xE0 && lead <= 0xEF) {
    length = 3
    if (lead === 0xE0) low = 0xA0
    if (lead === 0xED) high = 0x9F
  }
  else if (lead >= 0xF0 && lead <= 0xF4) {
    length = 4
    if (lead === 0xF0) low = 0x90
    if (lead === 0xF4) high = 0x8F
  }
  else return 0
  for (let k = 1; k < length; k++) {
    if (at + k >= bytes.length) return -1
    const next = bytes[at + k]!
    if (k === 1 ? next < low || next > high : next < 0x80 || next > 0xBF) return 0
  }
  return length
}

/** Where the bytes stop being UTF-8: the start of the first byte sequence that is not a character, or of one cut off by the end. */
export function utf8Length(bytes: Uint8Array): number {
  for (let at = 0; at < bytes.length;) {
    const length = characterAt(bytes, at)
    if (length <= 0) return at
    at += length
  }
  return bytes.length
}

/** A streaming decoder for such text; a character cut between two chunks waits for the rest. */
export class MixedTextDecoder {
  private carry: Buffer = Buffer.alloc(0)

  write(chunk: Buffer): string {
    const bytes = this.carry.length ? Buffer.concat([this.carry, chunk]) : chunk
    let text = ''
    let run = 0
    let at = 0
    while (at < bytes.length) {
      if (bytes[at]! < 0x80) {
        at++
        continue
      }
      const length = characterAt(bytes, at)
      if (length < 0) break
      if (length > 0) {
        at += length
        continue
      }
      text += bytes.toString('utf8', run, at) + SINGLE[bytes[at]!]
      run = ++at
    }
    text += bytes.toString('utf8', run, at)
    this.carry = Buffer.from(bytes.subarray(at))
    return text
  }

  /** The bytes of a character the file ended inside are not UTF-8: each reads as Windows-1252. */
  end(): string {
    const text = [...this.carry].map(byte => SINGLE[byte]).join('')
    this.carry = Buffer.alloc(0)
    return text
  }
}
