// Next.js calls register() once when a server process starts: the database upkeep begins here
// (app/_server/maintenance.ts). Node.js runtime only.
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs" || !process.env.DATABASE_URL) return
  const { startMaintenance } = await import("./app/_server/maintenance")
  startMaintenance()
}
