import "server-only"
import { cache } from "react"
import { getDb } from "@/db/client"
import { findShopSettings } from "@/db/queries/shop-settings"
import type { FormatPrefs } from "@/lib/format"

/** The shop's units and time zone, read once a request (lib/format writes every number and time with them). */
export const getFormatPrefs = cache(async (shopId: string): Promise<FormatPrefs> => {
  const { units, timeZone } = await findShopSettings(getDb(), shopId)
  return { units, timeZone }
})
