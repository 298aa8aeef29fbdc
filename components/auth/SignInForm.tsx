"use client";

import Link from "next/link";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { SignInInput } from "@/lib/schemas/account";
import { Button } from "@/components/ui/Button";
import { Field, Input } from "@/components/ui/Field";
import { FormMessage, PasswordInput, applyServerError, invalidProps, sendJson } from "./form-kit";
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
    window.location.assign(safeNext(next));
  });

  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Sign in">
      <Field label="E-mail" htmlFor="email" error={e.email?.message}>
        <Input id="email" type="email" autoComplete="email" inputMode="email" autoCapitalize="none" {...invalidProps("email", e.email?.message)} {...register("email")} />
      </Field>
      <Field label="Password" htmlFor="password" error={e.password?.message}>
        <PasswordInput id="password" autoComplete="current-password" {...invalidProps("password", e.password?.message)} {...register("password")} />
      </Field>
      <FormMessage message={message} />
      <Button type="submit" size="lg" className="w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Signing in…" : "Sign in"}
      </Button>
      <div className="flex flex-col gap-1 text-label">
        <Link href="/reset" className="flex min-h-tap items-center font-semibold text-glacier-700 underline-offset-4 hover:underline">
          Forgot your password?
        </Link>
        <Link href="/sign-up" className="flex min-h-tap items-center font-semibold text-glacier-700 underline-offset-4 hover:underline">
          New here? Start a farm account
        </Link>
      </div>
    </form>
  );
}
