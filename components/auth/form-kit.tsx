"use client";

import Link from "next/link";
import { useState } from "react";
import type { FieldValues, Path, UseFormSetError } from "react-hook-form";
import { Button } from "@/components/ui/Button";
import { Input } from "@/components/ui/Field";

// Small pieces every account form shares: send JSON to our API, put the server's field errors
// under the right fields, and say plainly when there is no connection.

export type ApiError = { code: string; message: string; fields?: Record<string, string> };
export type ApiResult<T> = { ok: true; status: number; data: T } | { ok: false; status: number; error: ApiError };

const offline: ApiError = {
  code: "offline",
  message: "No connection right now. This step needs the internet; try again when you have signal. Nothing on this phone was lost.",
};

export async function sendJson<T>(url: string, body: unknown, method = "POST"): Promise<ApiResult<T>> {
  let res: Response;
  try {
    res = await fetch(url, { method, headers: { "content-type": "application/json" }, body: JSON.stringify(body), credentials: "same-origin", cache: "no-store" });
  } catch {
    return { ok: false, status: 0, error: offline };
  }
  const data = await res.json().catch(() => null);
  if (res.ok) return { ok: true, status: res.status, data: data as T };
  const error: ApiError = data?.error ?? { code: "server_error", message: "Something went wrong on our side. Please try again in a moment." };
  return { ok: false, status: res.status, error };
}

/** Shows the server's field errors under the matching fields; returns the message for the form. */
export function applyServerError<F extends FieldValues>(setError: UseFormSetError<F>, error: ApiError, known: readonly string[]): string {
  let placed = false;
  for (const [field, message] of Object.entries(error.fields ?? {})) {
    if (known.includes(field)) {
      setError(field as Path<F>, { type: "server", message }, { shouldFocus: !placed });
      placed = true;
    }
  }
  return error.message;
}

export function FormMessage({ message, tone = "error" }: { message: string | null; tone?: "error" | "good" }) {
  if (!message) return null;
  const cls = tone === "error" ? "border-ember-600 bg-ember-100 text-ember-700" : "border-moss-600 bg-moss-100 text-moss-700";
  return (
    <p role={tone === "error" ? "alert" : "status"} className={`rounded-xl border-l-4 px-3 py-2 text-label font-medium ${cls}`}>
      {message}
    </p>
  );
}

/** A password box with a large show/hide switch (easier than retyping with cold fingers). */
export function PasswordInput({ ref, ...rest }: React.ComponentProps<"input">) {
  const [shown, setShown] = useState(false);
  return (
    <div className="relative">
      <Input ref={ref} type={shown ? "text" : "password"} className="pr-20" {...rest} />
      <button
        type="button"
        onClick={() => setShown((s) => !s)}
        className="absolute inset-y-0 right-0 flex min-h-tap min-w-tap items-center justify-center px-3 text-label font-semibold text-glacier-700"
        aria-label={shown ? "Hide password" : "Show password"}
        aria-pressed={shown}
      >
        {shown ? "Hide" : "Show"}
      </button>
    </div>
  );
}

/** aria attributes tying a control to its error message. */
export function invalidProps(id: string, error: string | undefined) {
  return error ? { "aria-invalid": true, "aria-describedby": `${id}-error` } : { "aria-invalid": false };
}

/** An e-mail box with the phone keyboard and autofill set up. */
export function EmailInput({ ref, ...rest }: React.ComponentProps<"input">) {
  return <Input ref={ref} type="email" autoComplete="email" inputMode="email" autoCapitalize="none" spellCheck={false} {...rest} />;
}

/** A quiet text link that is still a full-size touch target. */
export function TextLink({ href, children }: { href: string; children: React.ReactNode }) {
  return (
    <Link href={href} className="flex min-h-tap items-center text-label font-semibold text-glacier-700 underline-offset-4 hover:underline">
      {children}
    </Link>
  );
}

/** The form's main button: full width, says what is happening while it works. */
export function SubmitButton({ busy, busyLabel, children }: { busy: boolean; busyLabel: string; children: React.ReactNode }) {
  return (
    <Button type="submit" size="lg" className="w-full" disabled={busy}>
      {busy ? busyLabel : children}
    </Button>
  );
}
