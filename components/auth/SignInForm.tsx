"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { SignInInput } from "@/lib/schemas/account";
import { Field } from "@/components/ui/Field";
import { EmailInput, FormMessage, PasswordInput, SubmitButton, TextLink, applyServerError, invalidProps, sendJson } from "./form-kit";
import { safeNext } from "./next-path";

export function SignInForm({ next }: { next?: string }) {
  const form = useForm({ resolver: zodResolver(SignInInput.omit({ farmId: true })), defaultValues: { email: "", password: "" } });
  const { register, handleSubmit, formState, setError } = form;
  const [message, setMessage] = useState<string | null>(null);

  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const res = await sendJson("/api/auth/sign-in", values);
    if (!res.ok) {
      setMessage(applyServerError(setError, res.error, ["email", "password"]));
      return;
    }
    // A full load so the app shell starts fresh with the new identity.
    window.location.assign(safeNext(next, window.location.origin));
  });

  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Sign in">
      <Field label="E-mail" htmlFor="email" error={e.email?.message}>
        <EmailInput id="email" {...invalidProps("email", e.email?.message)} {...register("email")} />
      </Field>
      <Field label="Password" htmlFor="password" error={e.password?.message}>
        <PasswordInput id="password" autoComplete="current-password" {...invalidProps("password", e.password?.message)} {...register("password")} />
      </Field>
      <FormMessage message={message} />
      <SubmitButton busy={formState.isSubmitting} busyLabel="Signing in…">
        Sign in
      </SubmitButton>
      <div className="flex flex-col gap-1 text-label">
        <TextLink href="/reset">Forgot your password?</TextLink>
        <TextLink href="/sign-up">New here? Start a farm account</TextLink>
      </div>
    </form>
  );
}
