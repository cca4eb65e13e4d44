import { request } from 'node:http'
import { randomInt } from 'node:crypto'
import { Client } from './api'
import type { Reply } from './api'

/**
 * A client whose requests leave from another loopback address (Linux routes all of 127.0.0.0/8 to
 * the loopback device), so the server sees another IP: the sign-in throttle tells callers apart by it.
 * `host` overrides the Host header (the DNS-rebinding probe).
 */
export class ClientAt extends Client {
  constructor(readonly localAddress: string, readonly host?: string) {
    super()
  }

  override request<T = any>(method: string, path: string, body?: unknown, extraHeaders: Record<string, string> = {}): Promise<Reply<T>> {
    const url = new URL(path, this.base)
    const payload = body === undefined ? undefined : JSON.stringify(body)
    const headers: Record<string, string> = { accept: 'application/json', ...extraHeaders }
    if (payload !== undefined) headers['content-type'] = 'application/json'
    if (this.cookie) headers.cookie = this.cookie
    if (this.host) headers.host = this.host
    return new Promise((resolve, reject) => {
      const req = request({ hostname: '127.0.0.1', port: url.port, path: url.pathname + url.search, method, headers, localAddress: this.localAddress }, (res) => {
        const chunks: Buffer[] = []
        res.on('data', chunk => chunks.push(chunk))
        res.on('end', () => {
          const setCookie = res.headers['set-cookie'] ?? []
          if (setCookie.length) this.cookie = setCookie.map(c => c.split(';')[0]).join('; ')
          const text = Buffer.concat(chunks).toString('utf8')
          let parsed: unknown = text
          try {
            parsed = text ? JSON.parse(text) : null
          }
          catch { /* not JSON */ }
          const replyHeaders = new Headers()
          for (const [name, value] of Object.entries(res.headers)) {
            for (const one of [value].flat()) if (one !== undefined) replyHeaders.append(name, one)
          }
          resolve({ status: res.statusCode ?? 0, body: parsed as T, headers: replyHeaders })
        })
      })
      req.on('error', reject)
      if (payload !== undefined) req.write(payload)
      req.end()
    })
  }
}

/** A loopback address no other test uses (127.0.0.1 is everyone's), for a test of the throttle's per-address counts. */
export function freshLoopbackAddress(): string {
  return `127.${randomInt(1, 255)}.${randomInt(0, 256)}.${randomInt(2, 255)}`
}
