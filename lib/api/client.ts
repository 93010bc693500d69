// The browser's one way to the API (the office pages, TanStack Query's query functions, the recorder's start and
// co-driver screens): JSON in, JSON out, the API's `{error:{code,message,fields}}` turned into an ApiError. The
// recorder's sync (lib/recorder/recorder.ts) keeps its own transport: it must tell "offline, keep it" from "refused,
// drop it" per batch.
import type { JobListPage, NoticeList, SessionBody, Wire } from "./types"

export class ApiError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly fields?: Record<string, string>,
  ) {
    super(message)
  }
}

export async function apiFetch<T>(
  url: string,
  init: { method?: string; body?: unknown; cache?: RequestCache; signal?: AbortSignal } = {},
): Promise<T> {
  let res: Response
  try {
    res = await fetch(url, {
      method: init.method ?? "GET",
      headers: init.body !== undefined ? { "content-type": "application/json" } : undefined,
      body: init.body !== undefined ? JSON.stringify(init.body) : undefined,
      credentials: "same-origin",
      ...(init.cache ? { cache: init.cache } : {}),
      ...(init.signal ? { signal: init.signal } : {}),
    })
  } catch {
    throw new ApiError("No connection. Check the network and try again.", 0)
  }
  const json = await res.json().catch(() => null)
  if (!res.ok)
    throw new ApiError(json?.error?.message ?? `That did not work (${res.status}).`, res.status, json?.error?.fields)
  return json as T
}

/** The calls whose bodies are declared in lib/api/types.ts. */
export const api = {
  jobs: (query: string) => apiFetch<Wire<JobListPage>>(`/api/jobs?${query}`),
  notices: () => apiFetch<Wire<NoticeList>>("/api/notifications", { cache: "no-store" }),
  markAllNoticesRead: () =>
    apiFetch<{ updated: number }>("/api/notifications", { method: "PATCH", body: { all: true } }),
  signIn: (credentials: { email: string; password: string }) =>
    apiFetch<Wire<SessionBody>>("/api/session", { method: "POST", body: credentials }),
  signOut: () => apiFetch<null>("/api/session", { method: "DELETE" }),
}
