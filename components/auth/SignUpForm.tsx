"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { PASSWORD_MIN, SignUpInput } from "@/lib/schemas/account";
import { Field, Input } from "@/components/ui/Field";
import { EmailInput, FormMessage, PasswordInput, SubmitButton, TextLink, applyServerError, invalidProps, sendJson } from "./form-kit";

const fields = ["farmName", "name", "email", "password"] as const;

export function SignUpForm() {
  const { register, handleSubmit, formState, setError } = useForm({
    resolver: zodResolver(SignUpInput),
    defaultValues: { farmName: "", name: "", email: "", password: "" },
  });
  const [message, setMessage] = useState<string | null>(null);

  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const res = await sendJson("/api/auth/sign-up", values);
    if (!res.ok) {
      setMessage(applyServerError(setError, res.error, fields));
      return;
    }
    window.location.assign("/today");
  });

  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Start a farm account">
      <Field label="Farm name" htmlFor="farmName" error={e.farmName?.message} hint="Your nursery, farm, garden or seed library.">
        <Input id="farmName" autoComplete="organization" {...invalidProps("farmName", e.farmName?.message)} {...register("farmName")} />
      </Field>
      <Field label="Your name" htmlFor="name" error={e.name?.message}>
        <Input id="name" autoComplete="name" {...invalidProps("name", e.name?.message)} {...register("name")} />
      </Field>
      <Field label="E-mail" htmlFor="email" error={e.email?.message}>
        <EmailInput id="email" {...invalidProps("email", e.email?.message)} {...register("email")} />
      </Field>
      <Field label="Password" htmlFor="password" error={e.password?.message} hint={`At least ${PASSWORD_MIN} characters. A short sentence works well.`}>
        <PasswordInput id="password" autoComplete="new-password" {...invalidProps("password", e.password?.message)} {...register("password")} />
      </Field>
      <FormMessage message={message} />
      <SubmitButton busy={formState.isSubmitting} busyLabel="Setting up your farm…">
        Start the farm account
      </SubmitButton>
      <p className="text-label text-ink-soft">
        You will be the farm&apos;s Owner and can invite your team. A starter library of protocols with their published sources comes with it.
      </p>
      <TextLink href="/sign-in">Already have an account? Sign in</TextLink>
    </form>
  );
}
