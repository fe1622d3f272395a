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
  patch(path: string, body?: unknown) { return this.request('PATCH', path, body) }
  delete(path: string) { return this.request('DELETE', path) }

  /** A multipart/form-data upload of one file in the field "file" (fetch sets the boundary). */
  async upload(path: string, bytes: Uint8Array | string, filename: string, type = 'application/octet-stream', field = 'file') {
    const form = new FormData()
    form.append(field, new Blob([typeof bytes === 'string' ? new TextEncoder().encode(bytes) : bytes], { type }), filename)
    const headers: Record<string, string> = { accept: 'application/json' }
    if (this.cookie) headers.cookie = this.cookie
    if (this.address) headers['x-forwarded-for'] = this.address
    const res = await fetch(this.baseUrl + path, { method: 'POST', headers, body: form })
    const text = await res.text()
    let json: any = null
    try {
      json = text ? JSON.parse(text) : null
    }
    catch { json = text }
    return { status: res.status, headers: res.headers, body: json, text }
  }

  /** The raw bytes of a GET (files, PDFs). */
  async bytes(path: string) {
    const headers: Record<string, string> = {}
    if (this.cookie) headers.cookie = this.cookie
    if (this.address) headers['x-forwarded-for'] = this.address
    const res = await fetch(this.baseUrl + path, { headers })
    return { status: res.status, headers: res.headers, bytes: new Uint8Array(await res.arrayBuffer()) }
  }
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
