"use client";

import { useCallback, useEffect, useState } from "react";
import { roles, vocabularyLabels, type Role } from "@/lib/schemas/words";
import { Button } from "@/components/ui/Button";
import { Card, PageHeader } from "@/components/ui/Card";
import { Select } from "@/components/ui/Field";
import { FormMessage, sendJson, type ApiError } from "@/components/auth/form-kit";
import { InviteForm } from "./InviteForm";
import { SessionActions } from "./SessionActions";
import { roleHints } from "./role-hints";

type TeamMember = { membershipId: string; userId: string; name: string; email: string; role: Role; joinedAt: string };
type PendingInvite = { id: string; email: string; role: Role; createdAt: string; expiresAt: string; expired: boolean; invitedBy: string | null };
type Team = { you: { userId: string; role: Role; canManage: boolean }; members: TeamMember[]; invites: PendingInvite[] };

const day = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short" });

// The farm's team. Everyone sees who is on it; Owners change roles, remove people and invite.
// Team changes need a connection (they are not queued like checks): the panel says so offline.
export function TeamPanel() {
  const [team, setTeam] = useState<Team | null>(null);
  const [loadError, setLoadError] = useState<ApiError | null>(null);
  const [notice, setNotice] = useState<{ text: string; tone: "error" | "good" } | null>(null);
  const [busy, setBusy] = useState<string | null>(null);
  const [confirmRemove, setConfirmRemove] = useState<string | null>(null);

  const load = useCallback(async () => {
    try {
      const res = await fetch("/api/team", { cache: "no-store", credentials: "same-origin" });
      const body = await res.json().catch(() => null);
      if (!res.ok) {
        setLoadError(body?.error ?? { code: "server_error", message: "The team list could not be loaded." });
        return;
      }
      setTeam(body as Team);
      setLoadError(null);
    } catch {
      setLoadError({ code: "offline", message: "The team list needs a connection. Your bags and checks still work offline." });
    }
  }, []);

  useEffect(() => {
    void load();
    const again = () => void load();
    window.addEventListener("online", again);
    return () => window.removeEventListener("online", again);
  }, [load]);

  async function act(key: string, run: () => Promise<{ ok: boolean; error?: ApiError }>, success: string) {
    setBusy(key);
    setNotice(null);
    const res = await run();
    setBusy(null);
    setConfirmRemove(null);
    setNotice(res.ok ? { text: success, tone: "good" } : { text: res.error!.message, tone: "error" });
    await load();
  }

  const changeRole = (m: TeamMember, role: Role) =>
    act(`role:${m.membershipId}`, () => sendJson(`/api/team/${m.membershipId}`, { role }, "PATCH"), `${m.name} is now ${vocabularyLabels.role[role]}.`);
  const remove = (m: TeamMember) => act(`remove:${m.membershipId}`, () => sendJson(`/api/team/${m.membershipId}`, {}, "DELETE"), `${m.name} was removed from the farm.`);
  const resend = (i: PendingInvite) =>
    act(`resend:${i.id}`, async () => {
      const res = await sendJson<{ mailSent: boolean }>(`/api/invites/${i.id}/resend`, {});
      if (res.ok && !res.data.mailSent) return { ok: false, error: { code: "mail", message: "A new link was made, but the e-mail could not be sent just now. Try again in a little while." } };
      return res;
    }, `A fresh link went to ${i.email}; the old one no longer works.`);
  const revoke = (i: PendingInvite) => act(`revoke:${i.id}`, () => sendJson(`/api/invites/${i.id}`, {}, "DELETE"), `The invite to ${i.email} was withdrawn.`);

  const manage = team?.you.canManage ?? false;
  const owners = team?.members.filter((m) => m.role === "owner").length ?? 0;

  return (
    <div className="space-y-5">
      <PageHeader title="Team" subtitle={manage ? "Who works on this farm, and what each person may do." : "Who works on this farm. Only an Owner can change the team."} />
      <FormMessage message={notice?.text ?? null} tone={notice?.tone} />
      {loadError ? <FormMessage message={loadError.message} /> : null}
      {!team && !loadError ? <p className="text-ink-soft">Loading the team…</p> : null}

      {team ? (
        <Card className="space-y-1">
          <h2 className="text-label font-semibold uppercase tracking-wide text-glacier-600">Members ({team.members.length})</h2>
          <ul className="divide-y divide-rime-200">
            {team.members.map((m) => {
              const lastOwner = m.role === "owner" && owners <= 1;
              const you = m.userId === team.you.userId;
              return (
                <li key={m.membershipId} className="space-y-2 py-3">
                  <div className="flex items-start justify-between gap-3">
                    <div className="min-w-0">
                      <p className="font-semibold text-ink">
                        {m.name}
                        {you ? <span className="ml-2 text-label font-normal text-ink-soft">(you)</span> : null}
                      </p>
                      <p className="truncate text-label text-ink-soft">{m.email}</p>
                    </div>
                    {!manage ? <span className="rounded-full bg-rime-100 px-3 py-1 text-label font-semibold text-glacier-700">{vocabularyLabels.role[m.role]}</span> : null}
                  </div>
                  {manage ? (
                    <div className="flex flex-wrap items-center gap-2">
                      <label htmlFor={`role-${m.membershipId}`} className="sr-only">
                        Role of {m.name}
                      </label>
                      <Select
                        id={`role-${m.membershipId}`}
                        value={m.role}
                        className="w-auto min-w-40 flex-1"
                        disabled={busy !== null || lastOwner}
                        onChange={(e) => changeRole(m, e.target.value as Role)}
                      >
                        {roles.map((r) => (
                          <option key={r} value={r}>
                            {vocabularyLabels.role[r]}
                          </option>
                        ))}
                      </Select>
                      {lastOwner ? null : confirmRemove === m.membershipId ? (
                        <>
                          <Button tone="danger" onClick={() => remove(m)} disabled={busy !== null}>
                            {you ? "Yes, leave the farm" : `Yes, remove ${m.name.split(" ")[0]}`}
                          </Button>
                          <Button tone="quiet" onClick={() => setConfirmRemove(null)}>
                            Keep
                          </Button>
                        </>
                      ) : (
                        <Button tone="danger-outline" onClick={() => setConfirmRemove(m.membershipId)} disabled={busy !== null}>
                          {you ? "Leave" : "Remove"}
                        </Button>
                      )}
                    </div>
                  ) : null}
                  {manage && lastOwner ? <p className="text-label text-ink-soft">The only Owner: make someone else an Owner before changing this role.</p> : null}
                </li>
              );
            })}
          </ul>
        </Card>
      ) : null}

      {team && manage ? (
        <>
          <Card className="space-y-3">
            <h2 className="text-label font-semibold uppercase tracking-wide text-glacier-600">Invite someone</h2>
            <InviteForm onInvited={load} />
            <ul className="space-y-1 text-label text-ink-soft">
              {roles.map((r) => (
                <li key={r}>
                  <strong className="text-ink">{vocabularyLabels.role[r]}</strong>: {roleHints[r]}
                </li>
              ))}
            </ul>
          </Card>

          <Card className="space-y-1">
            <h2 className="text-label font-semibold uppercase tracking-wide text-glacier-600">Pending invites ({team.invites.length})</h2>
            {team.invites.length === 0 ? <p className="text-label text-ink-soft">No invites waiting.</p> : null}
            <ul className="divide-y divide-rime-200">
              {team.invites.map((i) => (
                <li key={i.id} className="space-y-2 py-3">
                  <div>
                    <p className="truncate font-semibold text-ink">{i.email}</p>
                    <p className="text-label text-ink-soft">
                      {vocabularyLabels.role[i.role]} ·{" "}
                      {i.expired ? <span className="font-semibold text-ember-700">link expired</span> : <>link works until {day.format(new Date(i.expiresAt))}</>}
                      {i.invitedBy ? <> · invited by {i.invitedBy}</> : null}
                    </p>
                  </div>
                  <div className="flex flex-wrap gap-2">
                    <Button tone="secondary" onClick={() => resend(i)} disabled={busy !== null}>
                      {busy === `resend:${i.id}` ? "Sending…" : "Send again"}
                    </Button>
                    <Button tone="danger-outline" onClick={() => revoke(i)} disabled={busy !== null}>
                      Withdraw
                    </Button>
                  </div>
                </li>
              ))}
            </ul>
          </Card>
        </>
      ) : null}

      <Card className="space-y-3">
        <h2 className="text-label font-semibold uppercase tracking-wide text-glacier-600">Signing out</h2>
        <SessionActions />
      </Card>
    </div>
  );
}
