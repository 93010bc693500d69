// Which browser origins count as the app's own for a write (the same-origin check of app/_server/route.ts).

/** The names a machine gives itself: an app served on one of them is the same app on the others. */
const LOOPBACK_HOSTS = new Set(["127.0.0.1", "localhost", "[::1]"])

/**
 * Whether a request's `Origin` is the app's own address (APP_URL). An app on a loopback address is also reached as
 * its other loopback names on the same scheme and port: a technician trying the app on the machine that runs it
 * types "localhost" as often as 127.0.0.1, and both are that one server. Any other host must match exactly.
 */
export function isAppOrigin(origin: string, appUrl: string): boolean {
  let sent: URL
  try {
    sent = new URL(origin)
  } catch {
    return false
  }
  const app = new URL(appUrl)
  if (sent.origin === app.origin) return true
  return (
    LOOPBACK_HOSTS.has(app.hostname) &&
    LOOPBACK_HOSTS.has(sent.hostname) &&
    sent.protocol === app.protocol &&
    sent.port === app.port
  )
}
