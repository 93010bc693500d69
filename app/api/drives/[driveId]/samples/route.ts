import { otherMethodsRefused } from "@/app/_server/route"
import { postSampleBatch } from "@/app/_server/sample-batch"

/** A batch of samples: app/_server/sample-batch.ts (shared with the app's server, scripts/server.mjs). */
export const POST = postSampleBatch

// A batch that names itself in the x-batch-id header reaches this file without the proxy (proxy.ts), so the file
// refuses the other methods itself, as the proxy does.
export const { GET, HEAD, PUT, PATCH, DELETE, OPTIONS } = otherMethodsRefused(["POST"])
