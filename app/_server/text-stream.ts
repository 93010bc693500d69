import "server-only"

/** How long a download may wait for its reader before it is cut and its database connection returned. */
const STREAM_IDLE_MS = 60_000

/**
 * A response body from text chunks (strings, or bytes already in UTF-8), made as the reader asks for them: nothing
 * is made ahead of the reader, so a slow client holds back the database cursor (or COPY) behind it instead of
 * filling memory. `close` runs once whatever happens: the last chunk sent, a failure part-way (the connection is
 * cut, so the reader sees an incomplete download), the reader gone, or a reader that takes nothing for `idleMs`
 * (also before the first chunk).
 */
export function textStream(
  chunks: AsyncGenerator<string | Uint8Array>,
  { close, idleMs = STREAM_IDLE_MS }: { close: () => Promise<void>; idleMs?: number },
): ReadableStream<Uint8Array> {
  const encoder = new TextEncoder()
  let timer: ReturnType<typeof setTimeout> | undefined
  let ended = false
  let cancelled = false
  const end = async () => {
    if (timer) clearTimeout(timer)
    timer = undefined
    if (ended) return
    ended = true
    await chunks.return(undefined).catch(() => {})
    await close().catch(() => {})
  }
  const watch = (controller: ReadableStreamDefaultController<Uint8Array>) => {
    timer = setTimeout(() => {
      timer = undefined
      controller.error(new Error("the reader took nothing for too long"))
      void end()
    }, idleMs)
    timer.unref?.()
  }
  return new ReadableStream<Uint8Array>(
    {
      start(controller) {
        watch(controller)
      },
      async pull(controller) {
        if (timer) clearTimeout(timer)
        timer = undefined
        try {
          for (;;) {
            const { value, done } = await chunks.next()
            if (done) {
              controller.close()
              await end()
              return
            }
            if (value.length === 0) continue
            if (cancelled) return
            controller.enqueue(typeof value === "string" ? encoder.encode(value) : value)
            break
          }
        } catch (error) {
          // A reader that went away while this chunk was being made: nothing failed, there is no one to tell.
          if (!cancelled) {
            console.error("[straightaway] a streamed download failed after it started:", (error as Error).message)
            controller.error(error)
          }
          await end()
          return
        }
        watch(controller)
      },
      async cancel() {
        cancelled = true
        await end()
      },
    },
    { highWaterMark: 0 },
  )
}
