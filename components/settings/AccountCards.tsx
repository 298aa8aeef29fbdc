"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { ChangePasswordForm, PASSWORD_MIN, ProfileInput } from "@/lib/schemas/account";
import { vocabularyLabels } from "@/lib/schemas/words";
import { adoptIdentity } from "@/lib/client/identity";
import { switchFarm, type IdentityWithFarms } from "@/lib/client/farm-switch";
import { nudgeSync } from "@/lib/client/sync-signal";
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";
import { Field, Input } from "@/components/ui/Field";
import { FormMessage, PasswordInput, applyServerError, invalidProps, sendJson } from "@/components/auth/form-kit";
import { describeLeftBehind } from "./account-words";

// The person's own account in Settings: their name, their password, and which farm this phone opens.
// These need signal (they change the account on the server, not the farm's records).

/** The farms this person belongs to, with one tap to open another. Shown only for more than one. */
export function FarmSwitcherCard({ identity }: { identity: IdentityWithFarms }) {
  const farms = identity.farms ?? [];
  const [busy, setBusy] = useState<string | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  if (farms.length < 2) return null;

  async function open(farmId: string) {
    setBusy(farmId);
    setMessage(null);
    const result = await switchFarm(farmId);
    if (result.ok) {
      // A fresh start: every screen and the sync loop read the new farm from here on.
      window.location.assign("/today");
      return;
    }
    setBusy(null);
    setMessage(result.reason === "unsent" ? describeLeftBehind(result.farmName, result.left) : result.message);
  }

  return (
    <Card>
      <h2 className="mb-1 text-body font-bold text-glacier-800">Your farms</h2>
      <p className="mb-3 text-label text-ink-soft">This phone holds one farm at a time. Switching sends what is waiting first, then loads the other farm.</p>
      <ul className="space-y-2" aria-label="Your farms">
        {farms.map((farm) => {
          const current = farm.id === identity.farm.id;
          const role = vocabularyLabels.role[farm.role];
          return (
            <li key={farm.id}>
              {current ? (
                <div className="flex min-h-tap items-center justify-between gap-3 rounded-xl border-2 border-glacier-500 bg-rime-50 px-3 py-2" aria-current="true">
                  <span className="min-w-0">
                    <span className="block break-words font-semibold">{farm.name}</span>
                    <span className="block text-label text-ink-soft">{role}</span>
                  </span>
                  <span className="shrink-0 text-label font-semibold text-glacier-700">Open now</span>
                </div>
              ) : (
                <button
                  type="button"
                  onClick={() => void open(farm.id)}
                  disabled={busy !== null}
                  aria-label={`Switch to ${farm.name} (${role})`}
                  className="flex min-h-tap w-full items-center justify-between gap-3 rounded-xl border-2 border-rime-200 bg-paper px-3 py-2 text-left hover:bg-rime-50 disabled:opacity-60"
                >
                  <span className="min-w-0">
                    <span className="block break-words font-semibold">{farm.name}</span>
                    <span className="block text-label text-ink-soft">{role}</span>
                  </span>
                  <span className="shrink-0 text-label font-semibold text-glacier-700">{busy === farm.id ? "Switching…" : "Switch"}</span>
                </button>
              )}
            </li>
          );
        })}
      </ul>
      <div className="mt-3">
        <FormMessage message={message} />
      </div>
    </Card>
  );
}

/** The name the team sees, on every farm. */
export function ProfileCard({ identity }: { identity: IdentityWithFarms }) {
  const { register, handleSubmit, formState, setError, reset } = useForm({ resolver: zodResolver(ProfileInput), defaultValues: { name: identity.user.name } });
  const [message, setMessage] = useState<{ text: string; tone: "error" | "good" } | null>(null);

  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const res = await sendJson<IdentityWithFarms>("/api/me", values, "PATCH");
    if (!res.ok) {
      setMessage({ text: applyServerError(setError, res.error, ["name"]), tone: "error" });
      return;
    }
    await adoptIdentity(res.data);
    nudgeSync(); // the team list on this phone picks the new name up with the next pull
    reset({ name: res.data.user.name });
    setMessage({ text: `Saved. Your team now sees you as ${res.data.user.name}.`, tone: "good" });
  });

  const e = formState.errors;
  return (
    <Card>
      <h2 className="mb-1 text-body font-bold text-glacier-800">You</h2>
      <p className="mb-3 text-label text-ink-soft">Signed in as {identity.user.email}.</p>
      <form onSubmit={onSubmit} noValidate className="space-y-3" aria-label="Your name">
        <Field label="Your name" htmlFor="profile-name" error={e.name?.message} hint="Shown on the team list and beside the checks you record.">
          <Input id="profile-name" autoComplete="name" {...invalidProps("profile-name", e.name?.message)} {...register("name")} />
        </Field>
        <FormMessage message={message?.text ?? null} tone={message?.tone} />
        <Button type="submit" tone="secondary" className="w-full" disabled={formState.isSubmitting || !formState.isDirty}>
          {formState.isSubmitting ? "Saving…" : "Save name"}
        </Button>
      </form>
    </Card>
  );
}

const passwordFields = ["currentPassword", "newPassword", "repeatPassword"] as const;
const emptyPasswords = { currentPassword: "", newPassword: "", repeatPassword: "" };

/** Change the password while signed in; every other phone and computer is signed out. */
export function PasswordCard() {
  const { register, handleSubmit, formState, setError, reset } = useForm({ resolver: zodResolver(ChangePasswordForm), defaultValues: emptyPasswords });
  const [message, setMessage] = useState<{ text: string; tone: "error" | "good" } | null>(null);

  const onSubmit = handleSubmit(async ({ currentPassword, newPassword }) => {
    setMessage(null);
    const res = await sendJson<{ message: string }>("/api/me/password", { currentPassword, newPassword });
    if (!res.ok) {
      setMessage({ text: applyServerError(setError, res.error, passwordFields), tone: "error" });
      return;
    }
    reset(emptyPasswords);
    setMessage({ text: res.data.message, tone: "good" });
  });

  const e = formState.errors;
  return (
    <Card>
      <h2 className="mb-1 text-body font-bold text-glacier-800">Password</h2>
      <p className="mb-3 text-label text-ink-soft">Changing it signs you out on every other phone and computer; this one stays signed in.</p>
      <form onSubmit={onSubmit} noValidate className="space-y-3" aria-label="Change password">
        <Field label="Current password" htmlFor="current-password" error={e.currentPassword?.message}>
          <PasswordInput id="current-password" autoComplete="current-password" {...invalidProps("current-password", e.currentPassword?.message)} {...register("currentPassword")} />
        </Field>
        <Field label="New password" htmlFor="new-password" error={e.newPassword?.message} hint={`At least ${PASSWORD_MIN} characters. A short sentence works well.`}>
          <PasswordInput id="new-password" autoComplete="new-password" {...invalidProps("new-password", e.newPassword?.message)} {...register("newPassword")} />
        </Field>
        <Field label="New password again" htmlFor="repeat-password" error={e.repeatPassword?.message}>
          <PasswordInput id="repeat-password" autoComplete="new-password" {...invalidProps("repeat-password", e.repeatPassword?.message)} {...register("repeatPassword")} />
        </Field>
        <FormMessage message={message?.text ?? null} tone={message?.tone} />
        <Button type="submit" tone="secondary" className="w-full" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Changing…" : "Change password"}
        </Button>
      </form>
    </Card>
  );
}
