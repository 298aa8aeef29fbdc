"use client";

import { useState } from "react";
import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { useOnline } from "@/lib/client/hooks";
import { refetchFarmCopy } from "@/lib/client/identity";
import { syncNowSoon } from "@/lib/client/sync-signal";
import { buttonClass, Button } from "@/components/ui/Button";
import { Card, PageHeader } from "@/components/ui/Card";
import { useMember } from "@/components/season/use-member";
import { vocabularyLabels, type Role } from "@/lib/schemas/words";

// Records: the farm's records as spreadsheet files, the Owner's backup, and restoring a backup into a new farm.
// Downloads come from the server (they need signal); everything else on the phone keeps working without it.

const exportsList = [
  { what: "bags", title: "Bags", contains: "One row per bag: code (as the label prints it), species, lot, state, cold store and box, medium, seed count, start date, pull window (planned and as moved by cold lost), pulled, sown and discarded dates, note." },
  { what: "checks", title: "Checks", contains: "Every check: when, bag code, moisture, mould, sprouts, actions, temperature, note and who checked." },
  { what: "sowings", title: "Sowings", contains: "Every sowing: date, bag code, species, tray, cells and seeds sown." },
  { what: "counts", title: "Germination counts", contains: "Every count: bag code, sowing date, count date, days after sowing, germinated so far, seeds sown and germination %." },
  { what: "readings", title: "Cold-store readings", contains: "Every temperature reading: cold store, kind, time, °C (and °F for a farm that reads °F), typed or imported." },
] as const;

type RestoreReport = { restored: Record<string, number>; photosWithoutPicture: number; membersToInvite: { name: string | null; email: string; role: Role }[] };
type RestoreState = { status: "idle" } | { status: "busy" } | { status: "done"; report: RestoreReport } | { status: "error"; message: string };

export function RecordsScreen() {
  const { identity, can } = useMember();
  const online = useOnline();
  // A new farm with no lots or bags yet: restoring a backup is the likely next step, so it comes first.
  const isNewFarm = useLiveQuery(async () => {
    const db = getLocalDb();
    return (await db.lots.count()) + (await db.bags.count()) === 0;
  }, []);
  if (identity === undefined) return <p className="text-ink-soft">Opening…</p>;
  const mayExport = can("export.read");
  const mayBackup = can("farm.backup");
  const mayRestore = can("farm.restore");

  return (
    <div className="space-y-5">
      <PageHeader title="Records" subtitle={`Download ${identity?.farm.name ?? "the farm"}'s records as spreadsheets${mayBackup ? ", and keep a full backup" : ""}.`} />

      {mayRestore && isNewFarm ? <RestorePanel /> : null}

      {!online ? (
        <p role="status" className="rounded-card bg-wheat-100 p-3 text-label">
          No signal: downloads come from the farm&apos;s server. Checks and other work still save on this phone meanwhile.
        </p>
      ) : null}

      {mayExport ? (
        <section aria-labelledby="exports-heading" className="space-y-3">
          <h2 id="exports-heading" className="text-title font-bold text-glacier-800">
            Spreadsheets (CSV)
          </h2>
          <p className="text-label text-ink-soft">
            Each file opens in Excel, LibreOffice or Google Sheets with its columns named in the first row. Files are UTF-8 with a byte-order mark,
            so accents and ° read right. Dates are yyyy-mm-dd, times are UTC.
          </p>
          <ul className="space-y-2">
            {exportsList.map((e) => (
              <li key={e.what}>
                <Card className="space-y-2">
                  <h3 className="font-semibold">{e.title}</h3>
                  <p className="text-label text-ink-soft">{e.contains}</p>
                  <a href={`/api/export?what=${e.what}&format=csv`} download className={buttonClass("quiet", "md", "w-full sm:w-auto")} data-testid={`export-${e.what}`}>
                    Download {e.title.toLowerCase()} (CSV)
                  </a>
                </Card>
              </li>
            ))}
          </ul>
        </section>
      ) : (
        <Card>
          <p>Your role on this farm does not include downloading records. The farm&apos;s Owner can change that on the Team screen.</p>
        </Card>
      )}

      {mayBackup ? (
        <section aria-labelledby="backup-heading" className="space-y-3">
          <h2 id="backup-heading" className="text-title font-bold text-glacier-800">
            Full backup
          </h2>
          <Card className="space-y-3">
            <p className="text-label">
              Everything the farm holds in one file: protocols, lots, cold stores and readings, bags, checks, sowings, counts, trials, the season plan and
              the change history, with members&apos; names, e-mails and roles (never passwords). Keep it somewhere safe; it restores into a new farm on any
              Rimebook server.
            </p>
            <div className="flex flex-col gap-2 sm:flex-row">
              <a href="/api/backup" download className={buttonClass("primary", "md")} data-testid="backup">
                Download backup
              </a>
              <a href="/api/backup?photos=1" download className={buttonClass("quiet", "md")} data-testid="backup-photos">
                Backup with photos (larger)
              </a>
            </div>
          </Card>
        </section>
      ) : null}

      {mayRestore && !isNewFarm ? <RestorePanel /> : null}
    </div>
  );
}

function RestorePanel() {
  const [file, setFile] = useState<File | null>(null);
  const [state, setState] = useState<RestoreState>({ status: "idle" });

  async function run() {
    if (!file) return;
    setState({ status: "busy" });
    try {
      const res = await fetch("/api/backup/restore", { method: "POST", headers: { "content-type": "application/json" }, body: file, credentials: "same-origin" });
      const body = (await res.json().catch(() => null)) as (RestoreReport & { error?: { message: string } }) | null;
      if (!res.ok || !body || body.error) {
        setState({ status: "error", message: body?.error?.message ?? `The server did not take the file (status ${res.status}). Nothing was changed.` });
        return;
      }
      // The farm is new from end to end: this phone drops its copy and fetches the restored one.
      await refetchFarmCopy();
      syncNowSoon();
      setState({ status: "done", report: body });
    } catch {
      setState({ status: "error", message: "No connection to the server. Restoring needs signal; nothing was changed." });
    }
  }

  const total = state.status === "done" ? Object.values(state.report.restored).reduce((a, b) => a + b, 0) : 0;
  return (
    <section aria-labelledby="restore-heading" className="space-y-3">
      <h2 id="restore-heading" className="text-title font-bold text-glacier-800">
        Restore a backup
      </h2>
      <Card className="space-y-3">
        <p className="text-label">
          Brings a backup file back into <strong>this farm, which must be new and empty</strong> (start a new farm account first). Every record comes
          back with the same bag codes; photos come back when the file was downloaded with photos. This is also how a farm moves to another Rimebook
          server. Nothing changes unless the whole file goes in.
        </p>
        <label className="block space-y-1">
          <span className="text-label font-semibold">Backup file (.json)</span>
          <input
            type="file"
            accept="application/json,.json"
            className="block min-h-tap w-full text-label file:mr-3 file:min-h-tap file:rounded-card file:border-0 file:bg-rime-100 file:px-4 file:font-semibold"
            onChange={(e) => {
              setFile(e.target.files?.[0] ?? null);
              setState({ status: "idle" });
            }}
            data-testid="restore-file"
          />
        </label>
        <Button size="lg" className="w-full" disabled={!file || state.status === "busy"} onClick={() => void run()} data-testid="restore-run">
          {state.status === "busy" ? "Restoring…" : "Restore into this farm"}
        </Button>
        {state.status === "error" ? (
          <p role="alert" className="rounded-card bg-ember-100 p-3 font-semibold text-ember-700">
            {state.message}
          </p>
        ) : null}
        {state.status === "done" ? (
          <div role="status" className="space-y-2 rounded-card bg-moss-100 p-3 text-label" data-testid="restore-done">
            <p className="font-semibold text-moss-700">Restored {total} records. This phone is fetching them now.</p>
            {state.report.photosWithoutPicture ? (
              <p>{state.report.photosWithoutPicture} photos were not in the file (download the backup with photos to bring them along).</p>
            ) : null}
            {state.report.membersToInvite.length ? (
              <p>
                Invite the other members again from the Team screen: {state.report.membersToInvite.map((m) => `${m.name ?? m.email} (${vocabularyLabels.role[m.role] ?? m.role})`).join(", ")}.
                Their past checks are kept, without their names.
              </p>
            ) : null}
          </div>
        ) : null}
      </Card>
    </section>
  );
}
