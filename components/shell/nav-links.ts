// Where the navigation goes, shared by the phone's bottom bar and the desktop's side column.

export interface NavLink {
  href: string;
  label: string;
  hint: string;
}

/** The season's work: from pulled bags to sow back to the plan, lots, recipes, stores and trials. */
export const seasonLinks: NavLink[] = [
  { href: "/sowing", label: "Sowing and counts", hint: "Pulled bags to sow, trays to count" },
  { href: "/plan", label: "Season plan", hint: "Start-by dates and seed needs" },
  { href: "/lots", label: "Seed lots", hint: "Species, source, year, quantity" },
  { href: "/protocols", label: "Protocols", hint: "Each species' recipe and its sources" },
  { href: "/stores", label: "Cold stores", hint: "Fridges, freezers and their readings" },
  { href: "/trials", label: "Trials", hint: "Compare treatments on a lot" },
];

/** The farm's own paperwork and people. */
export const farmLinks: NavLink[] = [
  { href: "/labels", label: "Labels", hint: "Print bag labels with codes" },
  { href: "/records", label: "Records", hint: "Download the farm's records and backup" },
  { href: "/team", label: "Team", hint: "Members and invitations" },
  { href: "/settings", label: "Settings", hint: "Farm, frost date, e-mail" },
];

export const isIn = (path: string, hrefs: string[]) => hrefs.some((h) => path === h || path.startsWith(`${h}/`));

/** Which of the three always-there places the path belongs to (the check sheet belongs to Scan). */
export const placeOf = (path: string): "today" | "scan" | "bags" | null =>
  path === "/today" ? "today" : path.startsWith("/scan") || path.startsWith("/check") ? "scan" : path.startsWith("/bags") ? "bags" : null;
