import type { Role } from "@/lib/schemas/words";

/** What each role may do, in a few words (the rules themselves live in lib/schemas/mutations.ts). */
export const roleHints: Record<Role, string> = {
  owner: "everything, including the team",
  grower: "plans, lots, protocols, bags and checks",
  helper: "checks, pulls, sowings and counts",
  visitor: "sees the records",
};
