import { beforeAll } from "vitest"
import { createTestShop, type TestShop } from "./db"
import { type ApiClient, signedIn } from "./http"

/** A fresh test shop and its people, one per role, each signed in on a client of their own. */
export type ShopTeam = { shop: TestShop; admin: ApiClient; lead: ApiClient; tech: ApiClient; codriver: ApiClient }

/**
 * A fresh shop for the enclosing describe block, made in a beforeAll, with its people signed in. The fields are
 * there once the block's tests run (not while the block is being declared).
 */
export function setUpShopTeam(label: string): ShopTeam {
  const team = {} as ShopTeam
  beforeAll(async () => {
    const shop = await createTestShop(label)
    const [admin, lead, tech, codriver] = await Promise.all([
      signedIn(shop.admin),
      signedIn(shop.lead),
      signedIn(shop.tech),
      signedIn(shop.codriver),
    ])
    Object.assign(team, { shop, admin, lead, tech, codriver })
  })
  return team
}
