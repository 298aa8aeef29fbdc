"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { InviteInput } from "@/lib/schemas/account";
import { roles, vocabularyLabels } from "@/lib/schemas/words";
import { Button } from "@/components/ui/Button";
import { Field, Select } from "@/components/ui/Field";
import { EmailInput, FormMessage, applyServerError, invalidProps, sendJson } from "@/components/auth/form-kit";
import { roleHints } from "./role-hints";

export function InviteForm({ onInvited }: { onInvited: () => void }) {
  const { register, handleSubmit, formState, setError, reset } = useForm({
    resolver: zodResolver(InviteInput),
    defaultValues: { email: "", role: "helper" as const },
  });
  const [message, setMessage] = useState<{ text: string; tone: "error" | "good" } | null>(null);

  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const res = await sendJson<{ mailSent: boolean; invite: { email: string } }>("/api/invites", values);
    if (!res.ok) {
      setMessage({ text: applyServerError(setError, res.error, ["email", "role"]), tone: "error" });
      return;
    }
    setMessage(
      res.data.mailSent
        ? { text: `Invite sent to ${res.data.invite.email}. The link works once, for 7 days.`, tone: "good" }
        : { text: `The invite to ${res.data.invite.email} is saved, but the e-mail could not be sent just now. Use “Send again” in a little while.`, tone: "error" },
    );
    reset({ email: "", role: values.role });
    onInvited();
  });

  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3" aria-label="Invite someone">
      <Field label="E-mail" htmlFor="invite-email" error={e.email?.message}>
        <EmailInput id="invite-email" autoComplete="off" {...invalidProps("invite-email", e.email?.message)} {...register("email")} />
      </Field>
      <Field label="Role" htmlFor="invite-role" error={e.role?.message}>
        <Select id="invite-role" {...register("role")}>
          {roles.map((r) => (
            <option key={r} value={r}>
              {vocabularyLabels.role[r]} — {roleHints[r]}
            </option>
          ))}
        </Select>
      </Field>
      <FormMessage message={message?.text ?? null} tone={message?.tone} />
      <Button type="submit" className="w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Sending…" : "Send invite"}
      </Button>
    </form>
  );
}
