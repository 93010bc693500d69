export function testEnv() {
  const baseUrl = process.env.TEST_BASE_URL
  const databaseUrl = process.env.DATABASE_URL
  if (!baseUrl || !databaseUrl) {
    throw new Error(
      "TEST_BASE_URL and DATABASE_URL are not set: run these suites through `npm test`, which starts the database and the app.",
    )
  }
  return { baseUrl, databaseUrl }
}
