"use client";

import Link from "next/link";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { ResetRequestInput } from "@/lib/schemas/account";
import { Button } from "@/components/ui/Button";
import { Field, Input } from "@/components/ui/Field";
import { FormMessage, applyServerError, invalidProps, sendJson } from "./form-kit";

export function ResetRequestForm() {
  const { register, handleSubmit, formState, setError } = useForm({ resolver: zodResolver(ResetRequestInput), defaultValues: { email: "" } });
  const [message, setMessage] = useState<string | null>(null);
  const [sent, setSent] = useState<string | null>(null);

  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const res = await sendJson<{ message: string }>("/api/auth/reset-request", values);
    if (!res.ok) {
      setMessage(applyServerError(setError, res.error, ["email"]));
      return;
    }
    setSent(res.data.message);
  });

  if (sent) {
    return (
      <div className="space-y-4">
        <FormMessage message={sent} tone="good" />
        <p className="text-label text-ink-soft">Nothing arrived? Check the spam folder, or ask again in a few minutes.</p>
        <Link href="/sign-in" className="flex min-h-tap items-center text-label font-semibold text-glacier-700 underline-offset-4 hover:underline">
          Back to sign in
        </Link>
      </div>
    );
  }
  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Ask for a new password">
      <Field label="E-mail" htmlFor="email" error={e.email?.message} hint="We will send a link to choose a new password.">
        <Input id="email" type="email" autoComplete="email" inputMode="email" autoCapitalize="none" {...invalidProps("email", e.email?.message)} {...register("email")} />
      </Field>
      <FormMessage message={message} />
      <Button type="submit" size="lg" className="w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Sending…" : "Send the link"}
      </Button>
      <Link href="/sign-in" className="flex min-h-tap items-center text-label font-semibold text-glacier-700 underline-offset-4 hover:underline">
        Back to sign in
      </Link>
    </form>
  );
}
