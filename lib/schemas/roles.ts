import { roles, type Role } from "./words";

// Who may do what, without zod: the least role for each mutation and each other action. The phone's
// screens ask `canRun` to hide what a role cannot do, so this stays out of the schema library's chunk;
// lib/schemas/mutations.ts pairs every name here with its argument schema (and the types make both
// tables list the same names).

export const mutationRoles = {
  "farm.update": "owner",
  "member.preferences": "visitor",
  "protocol.upsert": "grower",
  "protocol.delete": "grower",
  "lot.create": "grower",
  "lot.update": "grower",
  "lot.delete": "grower",
  "store.create": "grower",
  "store.update": "grower",
  "store.delete": "grower",
  "reading.record": "helper",
  "bag.create": "grower",
  "bag.update": "grower",
  "bag.pull": "helper",
  "bag.discard": "helper",
  "check.record": "helper",
  "sowing.record": "helper",
  "count.record": "helper",
  "trial.create": "grower",
  "trial.update": "grower",
  "trial.delete": "grower",
  "plan.upsert": "grower",
  "plan.delete": "grower",
} as const satisfies Record<string, Role>;

export type MutationName = keyof typeof mutationRoles;
export const mutationNames = Object.keys(mutationRoles) as MutationName[];

/** Actions that are not synced mutations but still need a role (team, exports, backups). */
export const actionTable = {
  "team.manage": "owner",
  "farm.backup": "owner",
  "farm.restore": "owner",
  "export.read": "visitor",
  "import.lots": "grower",
  "import.readings": "grower",
  "photo.upload": "helper",
} as const satisfies Record<string, Role>;
export type ActionName = keyof typeof actionTable;

const rank: Record<Role, number> = Object.fromEntries(roles.map((r, i) => [r, roles.length - i])) as Record<Role, number>;

/** Owner ⊃ Grower ⊃ Helper ⊃ Visitor. */
export function roleAtLeast(role: Role, needed: Role): boolean {
  return rank[role] >= rank[needed];
}

export function canRun(role: Role, name: MutationName | ActionName): boolean {
  const needed = name in mutationRoles ? mutationRoles[name as MutationName] : actionTable[name as ActionName];
  return needed !== undefined && roleAtLeast(role, needed);
}
