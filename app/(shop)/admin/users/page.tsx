import type { Metadata } from "next"
import { requirePageRole } from "@/app/_server/auth"
import { UserAdmin } from "@/components/admin/user-admin"
import { PageHeader } from "@/components/ui/page-header"
import { getDb } from "@/db/client"
import { listUsersInShop } from "@/db/queries/users"

export const metadata: Metadata = { title: "People" }

export default async function UsersPage() {
  const me = await requirePageRole("admin")
  const users = await listUsersInShop(getDb(), me.shopId)
  return (
    <>
      <PageHeader title="People" description="Who can sign in to your shop, and what each of them may do." />
      <UserAdmin
        meId={me.id}
        initialUsers={users.map((u) => ({
          id: u.id,
          email: u.email,
          name: u.name,
          role: u.role,
          disabled: u.disabled,
        }))}
      />
    </>
  )
}
