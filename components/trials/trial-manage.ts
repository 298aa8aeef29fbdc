import type { z } from "zod";
import type { TrialDetails } from "@/lib/schemas/trial";

// Pure wording and wiring for editing and deleting a trial (no React), so it is unit-tested.

type TrialEditOutput = z.output<typeof TrialDetails>;

/** Only the fields the person changed: another phone's edit of a field left alone is not overwritten. */
export function pickChangedFields(values: TrialEditOutput, dirty: Partial<Record<keyof TrialEditOutput, unknown>>): Partial<TrialEditOutput> {
  const keys = (Object.keys(values) as (keyof TrialEditOutput)[]).filter((k) => dirty[k]);
  return Object.fromEntries(keys.map((k) => [k, values[k] === "" ? null : values[k]])) as Partial<TrialEditOutput>;
}

/** What deleting a trial does, in words: the arms go, the bags and their records stay. */
export function describeTrialDelete(input: { armLabels: readonly string[]; bagsInArms: number; hasOwnProtocol: boolean }): string[] {
  const { armLabels, bagsInArms, hasOwnProtocol } = input;
  const lines = [
    bagsInArms === 0
      ? "No bag is in its arms yet."
      : `Its ${bagsInArms} bag${bagsInArms === 1 ? " is" : "s are"} not deleted: ${bagsInArms === 1 ? "it keeps its" : "they keep their"} checks, sowings and counts and just stop${bagsInArms === 1 ? "s" : ""} being compared.`,
    `The comparison and its arms (${armLabels.join(", ")}) go with it, on every phone once this one syncs.`,
  ];
  if (hasOwnProtocol) lines.push("The farm's own protocol made from this trial stays as it is, with its source written in it.");
  return lines;
}

