import type { Metadata } from "next";
import { cookies } from "next/headers";
import { redirect } from "next/navigation";
import { SignInForm } from "@/components/auth/SignInForm";
import { safeNext } from "@/components/auth/next-path";
import { findMember } from "@/lib/server/auth";
import { env } from "@/lib/server/env";
import { SESSION_COOKIE } from "@/lib/server/sessions";

export const metadata: Metadata = { title: "Sign in" };
export const dynamic = "force-dynamic";

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  const { next } = await searchParams;
  const token = (await cookies()).get(SESSION_COOKIE)?.value ?? null;
  if (await findMember(token)) redirect(safeNext(next, env.APP_ORIGIN));
  return (
    <section className="space-y-5">
      <div className="space-y-1">
        <h1 className="text-display font-bold leading-tight text-ink">Sign in</h1>
        <p className="text-ink-soft">Your farm&apos;s bags, checks and cold stores, on this phone.</p>
      </div>
      <SignInForm next={next} />
    </section>
  );
}
