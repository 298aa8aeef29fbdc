"use client";

import Link from "next/link";
import { usePathname, useRouter } from "next/navigation";
import { useEffect, useState } from "react";
import { signOut } from "@/lib/client/identity";
import type { WaitingTally } from "@/lib/client/waiting";
import { unsentWords } from "./sync-words";
import { BagsGlyph, MoreGlyph, ScanGlyph, SeasonGlyph, TodayGlyph } from "./NavIcons";

// Phone navigation: five thumb-sized targets at the bottom. Season and More open a short menu.

const seasonLinks = [
  { href: "/sowing", label: "Sowing and counts", hint: "Pulled bags to sow, trays to count" },
  { href: "/plan", label: "Season plan", hint: "Start-by dates and seed needs" },
  { href: "/lots", label: "Seed lots", hint: "Species, source, year, quantity" },
  { href: "/protocols", label: "Protocols", hint: "Each species' recipe and its sources" },
  { href: "/stores", label: "Cold stores", hint: "Fridges, freezers and their readings" },
  { href: "/trials", label: "Trials", hint: "Compare treatments on a lot" },
];
const moreLinks = [
  { href: "/labels", label: "Labels", hint: "Print bag labels with codes" },
  { href: "/records", label: "Records", hint: "Download the farm's records and backup" },
  { href: "/team", label: "Team", hint: "Members and invitations" },
  { href: "/settings", label: "Settings", hint: "Farm, frost date, e-mail" },
];

type Menu = "season" | "more" | null;

const isIn = (path: string, hrefs: string[]) => hrefs.some((h) => path === h || path.startsWith(`${h}/`));

export function BottomNav() {
  const path = usePathname() ?? "";
  const [menu, setMenu] = useState<Menu>(null);
  useEffect(() => setMenu(null), [path]);

  const tab = (active: boolean) =>
    `flex min-h-16 flex-1 flex-col items-center justify-center gap-0.5 text-[0.8125rem] font-semibold ${active ? "text-glacier-700" : "text-ink-soft"}`;

  return (
    <>
      {menu && <NavMenu which={menu} onClose={() => setMenu(null)} />}
      <nav aria-label="Main" className="no-print fixed inset-x-0 bottom-0 z-40 border-t border-rime-200 bg-white/95 pb-[env(safe-area-inset-bottom)] backdrop-blur">
        <div className="mx-auto flex max-w-xl">
          <Link href="/today" className={tab(path === "/today")} aria-current={path === "/today" ? "page" : undefined}>
            <TodayGlyph />
            Today
          </Link>
          <Link href="/scan" className={tab(path.startsWith("/scan") || path.startsWith("/check"))} aria-current={path.startsWith("/scan") ? "page" : undefined}>
            <ScanGlyph />
            Scan
          </Link>
          <Link href="/bags" className={tab(path.startsWith("/bags"))} aria-current={path.startsWith("/bags") ? "page" : undefined}>
            <BagsGlyph />
            Bags
          </Link>
          <button type="button" className={tab(menu === "season" || isIn(path, seasonLinks.map((l) => l.href)))} aria-expanded={menu === "season"} onClick={() => setMenu(menu === "season" ? null : "season")}>
            <SeasonGlyph />
            Season
          </button>
          <button type="button" className={tab(menu === "more" || isIn(path, moreLinks.map((l) => l.href)))} aria-expanded={menu === "more"} onClick={() => setMenu(menu === "more" ? null : "more")}>
            <MoreGlyph />
            More
          </button>
        </div>
      </nav>
    </>
  );
}

function NavMenu({ which, onClose }: { which: "season" | "more"; onClose: () => void }) {
  const links = which === "season" ? seasonLinks : moreLinks;
  return (
    <div className="fixed inset-0 z-30 bg-ink/30" onClick={onClose}>
      <div className="absolute inset-x-0 bottom-16 mx-auto max-w-xl px-3 pb-[env(safe-area-inset-bottom)]" onClick={(e) => e.stopPropagation()}>
        <ul className="overflow-hidden rounded-card border border-rime-200 bg-white shadow-xl" aria-label={which === "season" ? "Season" : "More"}>
          {links.map((l) => (
            <li key={l.href} className="border-b border-rime-100 last:border-0">
              <Link href={l.href} className="flex min-h-14 flex-col justify-center px-4 py-2 hover:bg-rime-50">
                <span className="font-semibold">{l.label}</span>
                <span className="text-label text-ink-soft">{l.hint}</span>
              </Link>
            </li>
          ))}
          {which === "more" && <SignOutItem />}
        </ul>
      </div>
    </div>
  );
}

function SignOutItem() {
  const router = useRouter();
  const [warning, setWarning] = useState<WaitingTally | null>(null);
  const [busy, setBusy] = useState(false);
  const go = async (force: boolean) => {
    setBusy(true);
    const result = await signOut({ force });
    setBusy(false);
    if (result.ok) router.replace("/sign-in");
    else setWarning(result.waiting);
  };
  return (
    <li className="px-4 py-3">
      {warning ? (
        <div role="alert" className="space-y-2">
          <p className="text-label">
            <strong className="text-ember-700">Not everything is sent yet.</strong> {unsentWords(warning)} only on this phone. Signing out now deletes{" "}
            {warning.records + warning.photos === 1 ? "it" : "them"}. Find signal and wait for &ldquo;Synced&rdquo; first if you can.
          </p>
          <div className="flex gap-2">
            <button type="button" onClick={() => setWarning(null)} className="min-h-tap rounded-card bg-glacier-700 px-4 font-semibold text-white">
              Stay signed in
            </button>
            <button type="button" disabled={busy} onClick={() => void go(true)} className="min-h-tap rounded-card px-3 font-semibold text-ember-700">
              Sign out anyway
            </button>
          </div>
        </div>
      ) : (
        <button type="button" disabled={busy} onClick={() => void go(false)} className="min-h-tap w-full text-left font-semibold text-ember-700">
          Sign out of this phone
        </button>
      )}
    </li>
  );
}
