// Fetch helpers for the office pages: JSON in, JSON out, the API's `{error:{code,message,fields}}` turned into an Error.

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
  let res: Response
  try {
    res = await fetch(url, {
      method: init.method ?? "GET",
      headers: init.body !== undefined ? { "content-type": "application/json" } : undefined,
      body: init.body !== undefined ? JSON.stringify(init.body) : undefined,
    })
  } catch {
    throw new ApiError("No connection. Check the network and try again.", 0)
  }
  const json = await res.json().catch(() => null)
  if (!res.ok)
    throw new ApiError(json?.error?.message ?? `That did not work (${res.status}).`, res.status, json?.error?.fields)
  return json as T
}
