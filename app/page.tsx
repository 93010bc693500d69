import { redirect } from "next/navigation"
import { getCurrentSession } from "@/app/_server/auth"
import { ROLE_HOME } from "@/lib/auth/roles"

export const dynamic = "force-dynamic"

export default async function Home() {
  const { user } = await getCurrentSession()
  redirect(user ? ROLE_HOME[user.role] : "/sign-in")
}
