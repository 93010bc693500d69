import { testEnv } from "../helpers/env"

export default async function setup() {
  const { baseUrl } = testEnv()
  const res = await fetch(`${baseUrl}/api/health`).catch(() => null)
  if (!res?.ok) throw new Error(`The app at ${baseUrl} is not answering; run the suites through \`npm test\`.`)
}
