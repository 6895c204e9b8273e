// A small HTTP client for API tests: keeps cookies like a browser, fetches the CSRF
// token the way a page does (from the rendered meta tag), and returns status + JSON.
import { expect, inject } from 'vitest'

export interface Reply<T = any> {
  status: number
  body: T
  headers: Headers
}
export interface RequestOptions {
  csrf?: boolean
  headers?: Record<string, string>
}

export class Client {
  // Another app instance of the same deployment (sessions and CSRF secrets are shared).
  constructor(readonly baseUrl: string = inject('baseUrl')) {}

  private cookies = new Map<string, string>()
  private csrf = ''

  private store(res: Response) {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';')
      const i = pair!.indexOf('=')
      const name = pair!.slice(0, i)
      const value = pair!.slice(i + 1)
      if (/max-age=0|expires=thu, 01 jan 1970/i.test(c) || value === '') this.cookies.delete(name)
      else this.cookies.set(name, value)
    }
  }

  private cookieHeader() {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ')
  }

  async raw(path: string, init: RequestInit = {}): Promise<Response> {
    const headers = new Headers(init.headers)
    if (this.cookies.size) headers.set('cookie', this.cookieHeader())
    const res = await fetch(new URL(path, this.baseUrl), { ...init, headers, redirect: 'manual' })
    this.store(res)
    return res
  }

  async page(path = '/'): Promise<string> {
    const res = await this.raw(path)
    const html = await res.text()
    const m = html.match(/<meta name="csrf-token" content="([^"]+)"/)
    if (m) this.csrf = m[1]!
    return html
  }

  /** A second client holding a copy of this one's cookies and CSRF token (a stolen cookie, or
   *  the same browser sent to another instance by a load balancer). */
  clone(baseUrl = this.baseUrl): Client {
    const copy = new Client(baseUrl)
    for (const [k, v] of this.cookies) copy.cookies.set(k, v)
    copy.csrf = this.csrf
    return copy
  }

  /** The cookie and CSRF headers this client would send, for a raw node:http request. */
  async authHeaders(): Promise<Record<string, string>> {
    if (!this.csrf) await this.page('/')
    return { 'cookie': this.cookieHeader(), 'csrf-token': this.csrf }
  }

  cookie(name: string): string | undefined {
    return this.cookies.get(name)
  }

  async request<T = any>(
    method: string,
    path: string,
    body?: unknown,
    opts: RequestOptions = {},
  ): Promise<Reply<T>> {
    if (method !== 'GET' && opts.csrf !== false && !this.csrf) await this.page('/')
    const headers: Record<string, string> = { ...opts.headers }
    if (body !== undefined && !(body instanceof FormData))
      headers['content-type'] = 'application/json'
    if (method !== 'GET' && opts.csrf !== false) headers['csrf-token'] = this.csrf
    const res = await this.raw(path, {
      method,
      headers,
      body:
        body === undefined
          ? undefined
          : body instanceof FormData
            ? body
            : typeof body === 'string'
              ? body
              : JSON.stringify(body),
    })
    const text = await res.text()
    let parsed: any = text
    try {
      parsed = JSON.parse(text)
    } catch {
      /* not JSON */
    }
    return { status: res.status, body: parsed, headers: res.headers }
  }

  get<T = any>(path: string) {
    return this.request<T>('GET', path)
  }

  post<T = any>(path: string, body?: unknown, opts?: RequestOptions) {
    return this.request<T>('POST', path, body ?? {}, opts)
  }

  delete<T = any>(path: string) {
    return this.request<T>('DELETE', path)
  }

  patch<T = any>(path: string, body?: unknown) {
    return this.request<T>('PATCH', path, body ?? {})
  }

  async signIn(email: string, password = 'tiltwright-demo') {
    const r = await this.post('/api/auth/login', { email, password })
    if (r.status !== 200)
      throw new Error(`sign-in of ${email} failed: ${r.status} ${JSON.stringify(r.body)}`)
    return r.body.user
  }
}

export const uniqueEmail = (tag: string) =>
  `${tag}-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 7)}@school.test`

/** A school as the register form sends it. */
export interface SchoolForm {
  name: string
  addressLine1: string
  city: string
  region: string
  postalCode: string
}

/** Registers a (not yet confirmed) teacher of `school` under a fresh address; returns it. */
export async function registerAccount(tag: string, password: string, school: SchoolForm) {
  const email = uniqueEmail(tag)
  const r = await new Client().post('/api/auth/register', {
    name: `Owner ${tag}`,
    email,
    password,
    school,
  })
  expect(r.status).toBe(201)
  return email
}
