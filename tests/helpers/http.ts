import { testEnv } from "./env"

let addressCounter = 0
/** A distinct client address per test client (the test server trusts X-Forwarded-For), so throttling stays per test. */
export function freshClientAddress() {
  addressCounter += 1
  return `test-client-${process.pid}-${addressCounter}`
}

export type ApiResponse<T = any> = { status: number; headers: Headers; body: T; text: string }

/** A small HTTP client that keeps one session cookie, like a browser tab. */
export class ApiClient {
  cookie: string | null = null
  /** `baseUrl`: another running app than the suites' own (the read-replica suite's second app). */
  constructor(
    readonly address = freshClientAddress(),
    readonly baseUrl?: string,
  ) {}

  async request<T = any>(
    method: string,
    path: string,
    body?: unknown,
    init: { raw?: string | Uint8Array; headers?: Record<string, string> } = {},
  ): Promise<ApiResponse<T>> {
    const headers = this.headers(init.headers)
    let payload: string | Uint8Array | undefined = init.raw
    if (body !== undefined) {
      headers["content-type"] ??= "application/json"
      payload = JSON.stringify(body)
    }
    const res = await fetch(this.url(path), {
      method,
      headers,
      body: payload as BodyInit | undefined,
      redirect: "manual",
    })
    const setCookie = res.headers.get("set-cookie")
    if (setCookie) {
      const pair = setCookie.split(";")[0]!
      this.cookie = pair.endsWith("=") ? null : pair
    }
    const text = await res.text()
    let parsed: unknown = text
    if ((res.headers.get("content-type") ?? "").includes("json") && text) parsed = JSON.parse(text)
    return { status: res.status, headers: res.headers, body: parsed as T, text }
  }

  /** A GET whose body is kept as bytes (an attachment, a thumbnail, a PDF): ApiClient.get reads bodies as text. */
  async getBytes(path: string) {
    const res = await fetch(this.url(path), { headers: this.headers(), redirect: "manual" })
    return { status: res.status, headers: res.headers, bytes: Buffer.from(await res.arrayBuffer()) }
  }

  private url(path: string) {
    return `${this.baseUrl ?? testEnv().baseUrl}${path}`
  }

  private headers(extra: Record<string, string> = {}) {
    const headers: Record<string, string> = { "x-forwarded-for": this.address, ...extra }
    if (this.cookie) headers.cookie = this.cookie
    return headers
  }

  get<T = any>(path: string) {
    return this.request<T>("GET", path)
  }
  post<T = any>(path: string, body?: unknown) {
    return this.request<T>("POST", path, body ?? {})
  }
  patch<T = any>(path: string, body: unknown) {
    return this.request<T>("PATCH", path, body)
  }
  delete<T = any>(path: string) {
    return this.request<T>("DELETE", path)
  }
}

export async function signedIn(user: { email: string; password: string }, baseUrl?: string) {
  const client = new ApiClient(undefined, baseUrl)
  const res = await client.post("/api/session", { email: user.email, password: user.password })
  if (res.status !== 200) throw new Error(`sign-in as ${user.email} failed: ${res.status} ${res.text}`)
  return client
}
