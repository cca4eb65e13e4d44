import { Readable } from 'node:stream'
import { describe, expect, it } from 'vitest'
import { detectFileEncoding } from '../../server/services/datasets/sniff'

// The reference is the WHATWG Encoding Standard's UTF-8 decoder as Node ships it (TextDecoder with
// fatal: true): a file is UTF-8 exactly when it decodes without error, however it is cut into chunks.
const isUtf8ByReference = (bytes: Uint8Array) => {
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(bytes)
    return true
  }
  catch {
    return false
  }
}

/** Whether the longest start of `bytes` that the reference decodes whole (up to the first error) holds a character beyond ASCII. */
function accentedBeforeFirstError(bytes: Buffer) {
  for (let end = bytes.length; end >= 0; end--) {
    if (isUtf8ByReference(bytes.subarray(0, end))) return bytes.subarray(0, end).some(byte => byte >= 0x80)
  }
  return false
}

function chunked(bytes: Buffer, sizes: number[]) {
  const chunks: Buffer[] = []
  for (let at = 0, i = 0; at < bytes.length; i++) {
    const size = sizes[i % sizes.length]!
    chunks.push(bytes.subarray(at, at + size))
    at += size
  }
  return async () => Readable.from(chunks)
}

// The first bytes are plain ASCII, so the decision rests on the pass over the whole file.
const head = Buffer.from('vendor,amount\n')

async function detect(body: Buffer, sizes: number[]) {
  const bytes = Buffer.concat([head, body])
  return (await detectFileEncoding(chunked(bytes, sizes), head)).encoding
}

describe('the encoding of a whole file, read in chunks', () => {
  const cafe = Buffer.from('Café Ölberg,12.50\nZ€ro ✓ 𝔘nit,3\n', 'utf8')

  it.each([[[1]], [[2]], [[3]], [[5, 1, 2]], [[1 << 16]]])('reads UTF-8 split anywhere by chunks of %j as UTF-8', async (sizes) => {
    expect(await detect(cafe, sizes)).toBe('utf-8')
  })

  it('reads a Latin-1 accent met late in a file of plain ASCII before it as Windows-1252', async () => {
    expect(await detect(Buffer.from([0x51, 0x75, 0x61, 0x79, 0x2C, 0x31, 0x0A, 0x43, 0x61, 0x66, 0xE9, 0x0A]), [7])).toBe('windows-1252')
  })

  it('reads a Latin-1 accent met late, after UTF-8 accents, as the bytes say (UTF-8, then Windows-1252)', async () => {
    expect(await detect(Buffer.concat([cafe, Buffer.from([0x43, 0x61, 0x66, 0xE9, 0x0A])]), [7])).toBe('utf-8+windows-1252')
  })

  it('reads a file cut inside its last character as not UTF-8 throughout, as the reference decoder refuses it', async () => {
    const cut = cafe.subarray(0, cafe.indexOf(Buffer.from('𝔘')) + 2)
    expect(isUtf8ByReference(Buffer.concat([head, cut]))).toBe(false)
    expect(await detect(cut, [3])).toBe('utf-8+windows-1252')
  })

  it('agrees with the reference decoder on random bytes under random chunkings', async () => {
    let state = 20261202
    const next = () => {
      state = (state * 48271) % 2147483647
      return state
    }
    // Mostly valid text with stray bytes of every kind: lead bytes, continuations, overlongs, surrogates.
    const pieces = ['a', 'é', '€', '𝔘', '\n'].map(t => Buffer.from(t)).concat([0x80, 0xBF, 0xC0, 0xC3, 0xE2, 0xED, 0xF0, 0xF4, 0xF8, 0xFF].map(b => Buffer.from([b])))
    for (let round = 0; round < 300; round++) {
      const parts = Array.from({ length: 1 + next() % 40 }, () => pieces[next() % (round % 3 === 0 ? pieces.length : 5)]!)
      const body = Buffer.concat(parts)
      const expected = isUtf8ByReference(Buffer.concat([head, body])) ? 'utf-8' : accentedBeforeFirstError(Buffer.concat([head, body])) ? 'utf-8+windows-1252' : 'windows-1252'
      expect(await detect(body, [1 + next() % 5, 1 + next() % 3])).toBe(expected)
    }
  })
})

describe('a file whose first bytes are Latin-1', () => {
  // The first bytes hold a Latin-1 "ü" (0xFC), which no UTF-8 text holds alone: Windows-1252 from the start.
  const latinHead = Buffer.from('vendor,amount\nM\u00FCller,1\n', 'latin1')
  const detectAfterLatin = async (body: Buffer, sizes: number[]) =>
    (await detectFileEncoding(chunked(Buffer.concat([latinHead, body]), sizes), latinHead)).encoding
  /** Whether some 2 to 4 bytes of `bytes` are one character beyond ASCII for the reference decoder. */
  const holdsUtf8Character = (bytes: Buffer) => {
    for (let at = 0; at < bytes.length; at++) {
      for (const length of [2, 3, 4]) {
        if (at + length <= bytes.length && isUtf8ByReference(bytes.subarray(at, at + length)) && [...bytes.subarray(at, at + length).toString('utf8')].length === 1) return true
      }
    }
    return false
  }

  it.each([[[1]], [[2]], [[3]], [[1 << 16]]])('reads UTF-8 met further on, split by chunks of %j, as the bytes say', async (sizes) => {
    expect(await detectAfterLatin(Buffer.from('Café Ölberg,12.50\n𝔘nit,3\n', 'utf8'), sizes)).toBe('utf-8+windows-1252')
  })

  it('stays Windows-1252 when every later accent is Latin-1 too', async () => {
    expect(await detectAfterLatin(Buffer.from('Caf\u00E9 \u00D6lberg,12.50\n\u00C0 la carte,3\n', 'latin1'), [3])).toBe('windows-1252')
  })

  it('agrees with the reference decoder on random bytes under random chunkings', async () => {
    let state = 20261203
    const next = () => {
      state = (state * 48271) % 2147483647
      return state
    }
    const pieces = ['a', 'é', '€', '𝔘', '\n'].map(t => Buffer.from(t)).concat([0x80, 0xA9, 0xBF, 0xC0, 0xC3, 0xE2, 0xED, 0xF0, 0xF4, 0xFC, 0xFF].map(b => Buffer.from([b])))
    for (let round = 0; round < 300; round++) {
      const body = Buffer.concat(Array.from({ length: 1 + next() % 30 }, () => pieces[5 + next() % (pieces.length - 5)]!).concat(round % 2 ? [pieces[next() % pieces.length]!] : []))
      const expected = holdsUtf8Character(Buffer.concat([latinHead, body])) ? 'utf-8+windows-1252' : 'windows-1252'
      expect(await detectAfterLatin(body, [1 + next() % 5, 1 + next() % 3]), body.toString('hex')).toBe(expected)
    }
  })
})
