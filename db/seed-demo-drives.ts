import type { Db } from "./client"

/** Demo jobs and recorded drives for the first shop (filled in once the track generator lands). */
export async function seedDemoJobsAndDrives(_db: Db, _shopId: string) {}
