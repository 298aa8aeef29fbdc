"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { BagsGlyph, FarmGlyph, ScanGlyph, SeasonGlyph, TodayGlyph } from "./NavIcons";
import { farmLinks, isIn, placeOf, seasonLinks, type NavLink } from "./nav-links";
import { SignOutItem } from "./SignOutItem";

// The desk's navigation (from 1024 px): every place in one column on the left, grouped as the phone's bar
// groups them, so the Owner plans, prints and reads trials without opening menus. Hidden on a phone.

const item = (active: boolean) =>
  `flex min-h-tap items-center gap-3 rounded-card px-3 font-semibold ${active ? "bg-glacier-700 text-white" : "text-ink hover:bg-rime-100"}`;

function Group({ title, glyph, links, path }: { title: string; glyph: React.ReactNode; links: NavLink[]; path: string }) {
  return (
    <li className="pt-1">
      <p className="flex items-center gap-2 px-3 text-label font-semibold uppercase tracking-wide text-ink-soft">
        {glyph}
        {title}
      </p>
      <ul>
        {links.map((l) => {
          const active = isIn(path, [l.href]);
          return (
            <li key={l.href}>
              <Link href={l.href} className={`${item(active)} pl-10 font-medium`} aria-current={active ? "page" : undefined} title={l.hint}>
                {l.label}
              </Link>
            </li>
          );
        })}
      </ul>
    </li>
  );
}

export function SideNav() {
  const path = usePathname() ?? "";
  const place = placeOf(path);
  return (
    <nav aria-label="Main" className="no-print fixed bottom-0 left-0 top-[3.8125rem] z-20 hidden w-60 overflow-y-auto border-r border-rime-200 bg-rime-50 px-3 py-2 lg:block">
      <ul>
        <li>
          <Link href="/today" className={item(place === "today")} aria-current={place === "today" ? "page" : undefined}>
            <TodayGlyph />
            Today
          </Link>
        </li>
        <li>
          <Link href="/scan" className={item(place === "scan")} aria-current={place === "scan" ? "page" : undefined}>
            <ScanGlyph />
            Scan
          </Link>
        </li>
        <li>
          <Link href="/bags" className={item(place === "bags")} aria-current={place === "bags" ? "page" : undefined}>
            <BagsGlyph />
            Bags
          </Link>
        </li>
        <Group title="Season" glyph={<SeasonGlyph className="h-5 w-5" />} links={seasonLinks} path={path} />
        <Group title="Farm" glyph={<FarmGlyph className="h-5 w-5" />} links={farmLinks} path={path} />
      </ul>
      <ul className="mt-1 border-t border-rime-200">
        <SignOutItem className="px-3" />
      </ul>
    </nav>
  );
}
