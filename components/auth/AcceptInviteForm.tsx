"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { InviteAcceptInput, NewMemberAcceptInput, PASSWORD_MIN } from "@/lib/schemas/account";
import { Field, Input } from "@/components/ui/Field";
import { FormMessage, PasswordInput, SubmitButton, TextLink, applyServerError, invalidProps, sendJson } from "./form-kit";

/** New people choose a name and password; someone with an account enters their existing password. */
export function AcceptInviteForm({ token, email, existingAccount }: { token: string; email: string; existingAccount: boolean }) {
  const { register, handleSubmit, formState, setError } = useForm({
    resolver: zodResolver(existingAccount ? InviteAcceptInput : NewMemberAcceptInput),
    // An existing account keeps its name: no name field, so no empty name to refuse.
    defaultValues: { token, name: existingAccount ? undefined : "", password: "" },
  });
  const [message, setMessage] = useState<string | null>(null);

  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const res = await sendJson("/api/invites/accept", existingAccount ? { token, password: values.password } : values);
    if (!res.ok) {
      setMessage(applyServerError(setError, res.error, ["name", "password"]));
      return;
    }
    window.location.assign("/today");
  });

  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Accept the invite">
      <input type="hidden" {...register("token")} />
      <div className="space-y-1">
        <p className="text-label font-semibold text-ink">E-mail</p>
        <p className="break-all rounded-xl bg-rime-100 px-3 py-2 text-ink">{email}</p>
      </div>
      {existingAccount ? null : (
        <Field label="Your name" htmlFor="name" error={e.name?.message} hint="As your team knows you.">
          <Input id="name" autoComplete="name" {...invalidProps("name", e.name?.message)} {...register("name")} />
        </Field>
      )}
      <Field
        label={existingAccount ? "Your Rimebook password" : "Choose a password"}
        htmlFor="password"
        error={e.password?.message}
        hint={existingAccount ? "This e-mail already has a Rimebook account; the farm will be added to it." : `At least ${PASSWORD_MIN} characters. A short sentence works well.`}
      >
        <PasswordInput id="password" autoComplete={existingAccount ? "current-password" : "new-password"} {...invalidProps("password", e.password?.message)} {...register("password")} />
      </Field>
      <FormMessage message={message} />
      <SubmitButton busy={formState.isSubmitting} busyLabel="Joining…">
        Join the farm
      </SubmitButton>
      {existingAccount ? (
        <TextLink href="/reset">Forgot that password?</TextLink>
      ) : null}
    </form>
  );
}
