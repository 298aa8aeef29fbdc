"use client";

import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { META, readMeta, type PhoneIdentity } from "@/lib/client/meta";
import { canRun, type ActionName, type MutationName } from "@/lib/schemas/mutations";
import type { TemperatureUnit } from "@/lib/domain";

/** The signed-in member as this phone remembers it (undefined while loading, null when signed out). */
export function useMember(): { identity: PhoneIdentity | null | undefined; can: (name: MutationName | ActionName) => boolean; unit: TemperatureUnit } {
  const identity = useLiveQuery(async () => (await readMeta<PhoneIdentity>(getLocalDb(), META.identity)) ?? null, []);
  const role = identity?.role;
  return {
    identity,
    can: (name) => (role ? canRun(role, name) : false),
    unit: identity?.farm.temperature_unit === "F" ? "F" : "C",
  };
}
