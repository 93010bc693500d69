import type { Metadata } from "next"
import { redirect } from "next/navigation"
import { getCurrentSession } from "@/app/_server/auth"
import { SignInForm } from "@/components/auth/sign-in-form"
import { Logo } from "@/components/shell/logo"
import { ROLE_HOME } from "@/lib/auth/roles"

export const metadata: Metadata = { title: "Sign in" }
export const dynamic = "force-dynamic"

export default async function SignInPage() {
  const { user } = await getCurrentSession()
  if (user) redirect(ROLE_HOME[user.role])
  return (
    <main className="mx-auto flex min-h-dvh max-w-sm flex-col justify-center gap-6 px-4 py-10 sm:max-w-md">
      <div className="flex items-center gap-3">
        <Logo className="size-12" />
        <div>
          <h1 className="text-2xl font-bold tracking-tight">Straightaway</h1>
          <p className="text-graphite-600 dark:text-graphite-300">Calibration drives, recorded and scored.</p>
        </div>
      </div>
      <div className="sm:rounded-xl sm:border sm:border-graphite-200 sm:bg-white sm:p-6 sm:shadow-sm sm:dark:border-asphalt-700 sm:dark:bg-asphalt-800">
        <SignInForm />
      </div>
    </main>
  )
}
