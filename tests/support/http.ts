import { inject } from 'vitest'

/** A tiny cookie-keeping client for the built server. */
export class Client {
  cookie = ''
  constructor(readonly baseUrl: string = inject('baseUrl'), readonly address?: string) {}

  async request(method: string, path: string, body?: unknown, headers: Record<string, string> = {}) {
    const init: RequestInit = { method, headers: { accept: 'application/json', ...headers } }
    const h = init.headers as Record<string, string>
    if (this.cookie) h.cookie = this.cookie
    if (this.address) h['x-forwarded-for'] = this.address
    if (body !== undefined) {
      h['content-type'] ??= 'application/json'
      init.body = typeof body === 'string' ? body : JSON.stringify(body)
    }
    const res = await fetch(this.baseUrl + path, init)
    const setCookie = res.headers.getSetCookie()
    for (const c of setCookie) {
      const pair = c.split(';')[0]!
      if (pair.startsWith('tightwell-session=')) this.cookie = pair.endsWith('=') ? '' : pair
    }
    const text = await res.text()
    let json: any = null
    try {
      json = text ? JSON.parse(text) : null
    }
    catch { json = text }
    return { status: res.status, headers: res.headers, body: json, text }
  }

  get(path: string) { return this.request('GET', path) }
  post(path: string, body?: unknown, headers?: Record<string, string>) { return this.request('POST', path, body, headers) }

  async signIn(email: string, password = 'tightwell-demo') {
    const res = await this.post('/api/auth/sign-in', { email, password })
    if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${res.text}`)
    return res
  }
}

let counter = 0
/** A fresh client address per test so the per-address sign-in limit of one test never touches another. */
export function freshAddress(): string {
  counter += 1
  return `198.51.100.${(counter % 250) + 1}`
}
