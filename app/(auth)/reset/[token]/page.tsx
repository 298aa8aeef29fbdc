import type { Metadata } from "next";
import { ResetConfirmForm } from "@/components/auth/ResetConfirmForm";

// The token stays out of other sites' logs: no referrer leaves this page.
export const metadata: Metadata = { title: "Choose a new password", referrer: "no-referrer" };

export default async function ResetConfirmPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  return (
    <section className="space-y-5">
      <div className="space-y-1">
        <h1 className="text-display font-bold leading-tight text-ink">Choose a new password</h1>
        <p className="text-ink-soft">After saving it you are signed in here, and signed out everywhere else.</p>
      </div>
      <ResetConfirmForm token={token} />
    </section>
  );
}
