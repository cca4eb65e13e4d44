import { describe, expect, it } from 'vitest'
import { canonicalJson } from '../../server/utils/fingerprint'
import { hashToken, createToken } from '../../server/utils/tokens'

describe('canonical JSON (analysis cache keys, settings comparison)', () => {
  it('gives equal values the same text whatever their key order, at every depth', () => {
    const a = { test: 'first-digit', filters: [{ op: 'equals', column: 'vendor', value: 'Quay' }], column: 'amount' }
    const b = { column: 'amount', filters: [{ value: 'Quay', column: 'vendor', op: 'equals' }], test: 'first-digit' }
    expect(canonicalJson(a)).toBe(canonicalJson(b))
    expect(canonicalJson(a)).toBe('{"column":"amount","filters":[{"column":"vendor","op":"equals","value":"Quay"}],"test":"first-digit"}')
  })

  it('sorts keys by UTF-16 code unit, as Array.prototype.sort does by default (ECMA-262), not by locale', () => {
    // A locale's collation puts "a" before "B"; code units put "B" (0x42) before "a" (0x61).
    expect(canonicalJson({ a: 1, B: 2 })).toBe('{"B":2,"a":1}')
  })

  it('leaves out keys whose value is undefined, as JSON.stringify does, and keeps array order', () => {
    expect(canonicalJson({ groupBy: undefined, sign: 'positive' })).toBe(canonicalJson({ sign: 'positive' }))
    expect(canonicalJson({ keys: [3, 1, 2], none: null })).toBe('{"keys":[3,1,2],"none":null}')
  })

  it('parses back to the same value', () => {
    const value = { z: [{ b: [1, { d: 4, c: 3 }], a: 'x' }], y: { n: 1.5, t: true } }
    expect(JSON.parse(canonicalJson(value))).toEqual(value)
  })
})

describe('tokens', () => {
  it('stores SHA-256 in hex: the FIPS 180-2 example digest of "abc"', () => {
    expect(hashToken('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad')
  })

  it('makes URL-safe tokens of 32 random bytes that do not repeat', () => {
    const tokens = Array.from({ length: 50 }, createToken)
    for (const token of tokens) {
      expect(token).toMatch(/^[\w-]{43}$/)
      expect(Buffer.from(token, 'base64url')).toHaveLength(32)
    }
    expect(new Set(tokens).size).toBe(tokens.length)
  })
})
