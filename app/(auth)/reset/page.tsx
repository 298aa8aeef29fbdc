import type { Metadata } from "next";
import { ResetRequestForm } from "@/components/auth/ResetRequestForm";

export const metadata: Metadata = { title: "New password" };

export default function ResetRequestPage() {
  return (
    <section className="space-y-5">
      <div className="space-y-1">
        <h1 className="text-display font-bold leading-tight text-ink">Forgot your password?</h1>
        <p className="text-ink-soft">It happens. Enter the e-mail you sign in with and we will send a link to choose a new one.</p>
      </div>
      <ResetRequestForm />
    </section>
  );
}
