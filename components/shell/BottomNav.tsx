"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { useEffect, useState } from "react";
import { BagsGlyph, FarmGlyph, ScanGlyph, SeasonGlyph, TodayGlyph } from "./NavIcons";
import { farmLinks, isIn, placeOf, seasonLinks } from "./nav-links";
import { SignOutItem } from "./SignOutItem";

// Phone navigation: five thumb-sized targets at the bottom. Season and Farm open a short menu. From 1024 px
// the side column (SideNav) takes over and this bar is hidden.

type Menu = "season" | "farm" | null;

export function BottomNav() {
  const path = usePathname() ?? "";
  const [menu, setMenu] = useState<Menu>(null);
  useEffect(() => setMenu(null), [path]);

  const place = placeOf(path);
  const tab = (active: boolean) =>
    `flex min-h-16 flex-1 flex-col items-center justify-center gap-0.5 text-[0.8125rem] font-semibold ${active ? "text-glacier-700" : "text-ink-soft"}`;

  return (
    <>
      {menu && <NavMenu which={menu} onClose={() => setMenu(null)} />}
      <nav aria-label="Main" className="no-print lg:hidden fixed inset-x-0 bottom-0 z-40 border-t border-rime-200 bg-paper/95 pb-[env(safe-area-inset-bottom)] backdrop-blur">
        <div className="mx-auto flex max-w-xl">
          <Link href="/today" className={tab(place === "today")} aria-current={place === "today" ? "page" : undefined}>
            <TodayGlyph />
            Today
          </Link>
          <Link href="/scan" className={tab(place === "scan")} aria-current={place === "scan" ? "page" : undefined}>
            <ScanGlyph />
            Scan
          </Link>
          <Link href="/bags" className={tab(place === "bags")} aria-current={place === "bags" ? "page" : undefined}>
            <BagsGlyph />
            Bags
          </Link>
          <button type="button" className={tab(menu === "season" || isIn(path, seasonLinks.map((l) => l.href)))} aria-expanded={menu === "season"} onClick={() => setMenu(menu === "season" ? null : "season")}>
            <SeasonGlyph />
            Season
          </button>
          <button type="button" className={tab(menu === "farm" || isIn(path, farmLinks.map((l) => l.href)))} aria-expanded={menu === "farm"} onClick={() => setMenu(menu === "farm" ? null : "farm")}>
            <FarmGlyph />
            Farm
          </button>
        </div>
      </nav>
    </>
  );
}

function NavMenu({ which, onClose }: { which: "season" | "farm"; onClose: () => void }) {
  const links = which === "season" ? seasonLinks : farmLinks;
  return (
    <div className="fixed inset-0 z-30 bg-ink/30 lg:hidden" onClick={onClose}>
      <div className="absolute inset-x-0 bottom-16 mx-auto max-w-xl px-3 pb-[env(safe-area-inset-bottom)]" onClick={(e) => e.stopPropagation()}>
        <ul className="overflow-hidden rounded-card border border-rime-200 bg-paper shadow-xl" aria-label={which === "season" ? "Season" : "Farm"}>
          {links.map((l) => (
            <li key={l.href} className="border-b border-rime-100 last:border-0">
              <Link href={l.href} className="flex min-h-14 flex-col justify-center px-4 py-2 hover:bg-rime-50">
                <span className="font-semibold">{l.label}</span>
                <span className="text-label text-ink-soft">{l.hint}</span>
              </Link>
            </li>
          ))}
          {which === "farm" && <SignOutItem />}
        </ul>
      </div>
    </div>
  );
}
