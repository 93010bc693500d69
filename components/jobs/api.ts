// Small fetch helpers for the jobs pages: JSON in, JSON out, the API's error shape turned into an Error.

export class ApiError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly fields?: Record<string, string>,
  ) {
    super(message)
  }
}

export async function apiFetch<T>(url: string, init: { method?: string; body?: unknown } = {}): Promise<T> {
  const res = await fetch(url, {
    method: init.method ?? "GET",
    headers: init.body !== undefined ? { "content-type": "application/json" } : undefined,
    body: init.body !== undefined ? JSON.stringify(init.body) : undefined,
  })
  const json = await res.json().catch(() => null)
  if (!res.ok) throw new ApiError(json?.error?.message ?? `That did not work (${res.status}).`, res.status, json?.error?.fields)
  return json as T
}
