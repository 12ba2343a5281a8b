/** A minimal cookie-keeping client for load runs: one per simulated user, so each has its own session. */
export class HttpSession {
  private cookies = new Map<string, string>()
  constructor(readonly base: string) {}

  private absorb(res: Response) {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';')
      const i = pair!.indexOf('=')
      this.cookies.set(pair!.slice(0, i), pair!.slice(i + 1))
    }
  }

  private headers(json: boolean): Record<string, string> {
    const h: Record<string, string> = { cookie: [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ') }
    const csrf = this.cookies.get('dw_csrf')
    if (csrf) h['x-csrf-token'] = decodeURIComponent(csrf)
    if (json) h['content-type'] = 'application/json'
    return h
  }

  async request(method: string, path: string, body?: unknown): Promise<{ status: number; ms: number; json: any }> {
    const t0 = performance.now()
    const res = await fetch(this.base + path, { method, headers: this.headers(body !== undefined), body: body === undefined ? undefined : JSON.stringify(body) })
    this.absorb(res)
    const text = await res.text()
    const ms = performance.now() - t0
    let json: any = null
    try { json = text ? JSON.parse(text) : null } catch { json = text }
    return { status: res.status, ms, json }
  }

  async signIn(email: string, password: string) {
    await this.request('GET', '/api/auth/csrf')
    const r = await this.request('POST', '/api/auth/login', { email, password })
    if (r.status !== 200) throw new Error(`sign-in of ${email} failed: ${r.status} ${JSON.stringify(r.json)}`)
  }
}
