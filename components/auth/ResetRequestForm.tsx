"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { ResetRequestInput } from "@/lib/schemas/account";
import { Field } from "@/components/ui/Field";
import { EmailInput, FormMessage, SubmitButton, TextLink, applyServerError, invalidProps, sendJson } from "./form-kit";

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
        <TextLink href="/sign-in">Back to sign in</TextLink>
      </div>
    );
  }
  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Ask for a new password">
      <Field label="E-mail" htmlFor="email" error={e.email?.message} hint="We will send a link to choose a new password.">
        <EmailInput id="email" {...invalidProps("email", e.email?.message)} {...register("email")} />
      </Field>
      <FormMessage message={message} />
      <SubmitButton busy={formState.isSubmitting} busyLabel="Sending…">
        Send the link
      </SubmitButton>
      <TextLink href="/sign-in">Back to sign in</TextLink>
    </form>
  );
}
