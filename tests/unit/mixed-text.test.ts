import { describe, expect, it } from 'vitest'
import { MixedTextDecoder, utf8Length } from '../../server/services/datasets/mixed-text'

// References: Node's own decoders. TextDecoder('utf-8') for the UTF-8 part and TextDecoder('windows-1252')
// (the WHATWG Encoding Standard's tables) for single bytes that are not UTF-8.
const utf8 = (text: string) => Buffer.from(text, 'utf8')
// Streaming, as Node 20's one-shot decode reads 0x80-0x9F as ISO-8859-1 (seen here: 0x80 gave U+0080).
const cp1252 = (bytes: number[]) => new TextDecoder('windows-1252').decode(Uint8Array.from(bytes), { stream: true })

function decodeInChunks(bytes: Buffer, size: number) {
  const decoder = new MixedTextDecoder()
  let text = ''
  for (let at = 0; at < bytes.length; at += size) text += decoder.write(bytes.subarray(at, at + size))
  return text + decoder.end()
}

describe('text that turns from UTF-8 to Latin-1', () => {
  const file = Buffer.concat([utf8('Café Ölberg,12.50\nZ€ro ✓ 𝔘nit,3\n'), Buffer.from([0x4D, 0xFC, 0x6C, 0x6C, 0x65, 0x72, 0x2C, 0x80, 0x39, 0x0A])])

  it.each([1, 2, 3, 7, 1 << 16])('reads each part as its bytes say, in chunks of %i bytes', (size) => {
    expect(decodeInChunks(file, size)).toBe(`Café Ölberg,12.50\nZ€ro ✓ 𝔘nit,3\n${cp1252([0x4D, 0xFC, 0x6C, 0x6C, 0x65, 0x72, 0x2C, 0x80, 0x39, 0x0A])}`)
    expect(decodeInChunks(file, size)).toContain('Müller,€9')
  })

  it('reads valid UTF-8 exactly as the reference decoder does', () => {
    const text = 'a é € 𝔘 \u{10FFFF} \uFFFD'
    expect(decodeInChunks(utf8(text), 1)).toBe(new TextDecoder('utf-8').decode(utf8(text)))
  })

  it('reads overlong forms, surrogates and a cut last character byte by byte as Windows-1252', () => {
    for (const bytes of [[0xC0, 0xAF], [0xE0, 0x80, 0xAF], [0xED, 0xA0, 0x80], [0xF4, 0x90, 0x80, 0x80], [0xE2, 0x82]]) {
      expect(decodeInChunks(Buffer.from(bytes), 1), bytes.join(' ')).toBe(cp1252(bytes))
    }
  })

  it('says where the bytes stop being UTF-8', () => {
    expect(utf8Length(utf8('Café'))).toBe(5)
    expect(utf8Length(Buffer.concat([utf8('Café'), Buffer.from([0xE9])]))).toBe(5)
    expect(utf8Length(Buffer.concat([utf8('Ca'), Buffer.from([0xE2, 0x82])]))).toBe(2)
  })
})
