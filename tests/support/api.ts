// A small HTTP client for server tests: keeps the session cookie like a browser would.
export const baseUrl = process.env.MANTISSA_TEST_URL ?? 'http://localhost:3101'

export interface Reply<T = any> {
  status: number
  body: T
  headers: Headers
}

export class Client {
  cookie = ''

  /** `base`: another app server than the one `npm test` starts (the fault and S3 tests run their own). */
  constructor(readonly base = baseUrl) {}

  /** `body`: FormData, a ReadableStream (sent as it streams, with `headers` naming its type), or JSON. */
  async request<T = any>(method: string, path: string, body?: unknown, extraHeaders: Record<string, string> = {}): Promise<Reply<T>> {
    const headers: Record<string, string> = { accept: 'application/json', ...extraHeaders }
    if (this.cookie) headers.cookie = this.cookie
    let payload: BodyInit | undefined
    if (body instanceof FormData || body instanceof ReadableStream) payload = body
    else if (body !== undefined) {
      headers['content-type'] = 'application/json'
      payload = JSON.stringify(body)
    }
    const response = await fetch(`${this.base}${path}`, { method, headers, body: payload, redirect: 'manual', ...(payload instanceof ReadableStream ? { duplex: 'half' } : {}) })
    const setCookie = response.headers.getSetCookie()
    if (setCookie.length) this.cookie = setCookie.map(c => c.split(';')[0]).join('; ')
    const text = await response.text()
    let parsed: unknown = text
    try {
      parsed = text ? JSON.parse(text) : null
    }
    catch { /* not JSON */ }
    return { status: response.status, body: parsed as T, headers: response.headers }
  }

  get<T = any>(path: string) {
    return this.request<T>('GET', path)
  }

  post<T = any>(path: string, body?: unknown) {
    return this.request<T>('POST', path, body ?? {})
  }

  patch<T = any>(path: string, body?: unknown) {
    return this.request<T>('PATCH', path, body ?? {})
  }

  delete<T = any>(path: string, body?: unknown) {
    return this.request<T>('DELETE', path, body)
  }
}

/** A client signed in with e-mail and password; fails the test when sign-in does not answer 200. */
export async function signedIn(email: string, password: string, base = baseUrl): Promise<Client> {
  const client = new Client(base)
  const reply = await client.post('/api/auth/login', { email, password })
  if (reply.status !== 200) throw new Error(`sign-in as ${email} answered ${reply.status}: ${JSON.stringify(reply.body)}`)
  return client
}
