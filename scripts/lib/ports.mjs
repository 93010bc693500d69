// Whether a TCP port can be listened on, checked before `npm start` starts anything (so a second start on the same
// ports says so in one line and touches nothing of the first).
import net from "node:net"

export function portIsFree(port, host = "127.0.0.1") {
  return new Promise((resolve) => {
    const server = net.createServer()
    server.once("error", () => resolve(false))
    server.listen({ port, host, exclusive: true }, () => server.close(() => resolve(true)))
  })
}

/** The first of `[name, port]` pairs that is taken, or null. */
export async function firstBusyPort(pairs, host) {
  for (const [name, port] of pairs) if (!(await portIsFree(port, host))) return { name, port }
  return null
}
