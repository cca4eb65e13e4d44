import { describe, expect, it } from 'vitest'
import { UnsealedCookies } from '../../../server/services/account/unsealed-cookies'

const session = (createdAt: number) => ({ id: 's1', createdAt, data: { user: { id: 'u1', name: 'A. Reporter' }, secure: { token: 't' } } })

describe('session cookies unsealed once per server', () => {
  it('answers a cookie it has seen with a copy that a request may change without changing the next', () => {
    const cookies = new UnsealedCookies(60_000, 10, () => 1_000)
    cookies.remember('sealed-a', session(500))
    const first = cookies.get('sealed-a')!
    expect(first.data.user).toEqual({ id: 'u1', name: 'A. Reporter' })
    first.data.user = null
    expect(cookies.get('sealed-a')!.data.user).toEqual({ id: 'u1', name: 'A. Reporter' })
    expect(cookies.get('sealed-b')).toBeUndefined()
  })

  it('stops answering once the session is older than the maximum age, as h3 would refuse it', () => {
    let now = 1_000
    const cookies = new UnsealedCookies(60_000, 10, () => now)
    cookies.remember('sealed-a', session(1_000))
    now = 61_000
    expect(cookies.get('sealed-a')).toBeDefined()
    now = 61_001
    expect(cookies.get('sealed-a')).toBeUndefined()
    now = 1_000
    expect(cookies.get('sealed-a')).toBeUndefined()
  })

  it('keeps only signed-in sessions, and at most as many as it is told', () => {
    const cookies = new UnsealedCookies(60_000, 2, () => 1_000)
    cookies.remember('empty', { id: 's0', createdAt: 1_000, data: {} })
    expect(cookies.get('empty')).toBeUndefined()
    for (const name of ['a', 'b', 'c']) cookies.remember(name, session(1_000))
    expect(cookies.get('a')).toBeUndefined()
    expect(cookies.get('c')).toBeDefined()
  })
})
