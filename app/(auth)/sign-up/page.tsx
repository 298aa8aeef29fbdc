import type { Metadata } from "next";
import { SignUpForm } from "@/components/auth/SignUpForm";

export const metadata: Metadata = { title: "Start a farm account" };

export default function SignUpPage() {
  return (
    <section className="space-y-5">
      <div className="space-y-1">
        <h1 className="text-display font-bold leading-tight text-ink">Start a farm account</h1>
        <p className="text-ink-soft">One account for the whole farm. You can invite growers and helpers afterwards.</p>
      </div>
      <SignUpForm />
    </section>
  );
}
