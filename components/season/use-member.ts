"use client";

import { useIdentity } from "@/lib/client/hooks";
import type { PhoneIdentity } from "@/lib/client/meta";
import { canRun, type ActionName, type MutationName } from "@/lib/schemas/roles";
import type { TemperatureUnit } from "@/lib/domain/units";

/** The signed-in member with what their role may do and the farm's temperature unit. */
export function useMember(): { identity: PhoneIdentity | null | undefined; can: (name: MutationName | ActionName) => boolean; unit: TemperatureUnit } {
  const identity = useIdentity();
  const role = identity?.role;
  return {
    identity,
    can: (name) => (role ? canRun(role, name) : false),
    unit: identity?.farm.temperature_unit === "F" ? "F" : "C",
  };
}
