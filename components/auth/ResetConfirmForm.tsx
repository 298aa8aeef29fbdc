"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { PASSWORD_MIN, ResetConfirmInput } from "@/lib/schemas/account";
import { Field } from "@/components/ui/Field";
import { FormMessage, PasswordInput, SubmitButton, TextLink, applyServerError, invalidProps, sendJson } from "./form-kit";

export function ResetConfirmForm({ token }: { token: string }) {
  const { register, handleSubmit, formState, setError } = useForm({ resolver: zodResolver(ResetConfirmInput), defaultValues: { token, password: "" } });
  const [message, setMessage] = useState<string | null>(null);
  const [linkDead, setLinkDead] = useState(false);

  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const res = await sendJson<{ signedIn?: boolean }>("/api/auth/reset-confirm", values);
    if (!res.ok) {
      setLinkDead(res.status === 404 || res.status === 410 || Boolean(res.error.fields?.token));
      setMessage(applyServerError(setError, res.error, ["password"]));
      return;
    }
    window.location.assign(res.data.signedIn === false ? "/sign-in" : "/today");
  });

  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Choose a new password">
      <input type="hidden" {...register("token")} />
      <Field label="New password" htmlFor="password" error={e.password?.message ?? e.token?.message} hint={`At least ${PASSWORD_MIN} characters. This signs you out on every other phone and computer.`}>
        <PasswordInput id="password" autoComplete="new-password" {...invalidProps("password", e.password?.message)} {...register("password")} />
      </Field>
      <FormMessage message={message} />
      {linkDead ? (
        <TextLink href="/reset">Ask for a new link</TextLink>
      ) : null}
      <SubmitButton busy={formState.isSubmitting} busyLabel="Saving…">
        Save the new password
      </SubmitButton>
    </form>
  );
}
