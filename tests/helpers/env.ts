export function testEnv() {
  const baseUrl = process.env.BASE_URL
  const databaseUrl = process.env.DATABASE_URL
  if (!baseUrl || !databaseUrl) {
    throw new Error("BASE_URL and DATABASE_URL are not set: run these suites through `npm test`, which starts the database and the app.")
  }
  return { baseUrl, databaseUrl }
}
