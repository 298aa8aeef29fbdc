import type { MutationName } from "@/lib/schemas/mutations";

// A new farm's first steps, in the order the job needs them: somewhere cold, seed, a bag, its label.

export type FirstStepKey = "store" | "lot" | "bag" | "label";

export interface FirstStep {
  key: FirstStepKey;
  title: string;
  hint: string;
  href: string;
  /** What the person's role must be allowed to do for the button to be theirs. */
  needs: MutationName;
  done: boolean;
  /** The first step not yet done: the one button drawn as the next thing to do. */
  next: boolean;
}

/** The steps, or null once the farm has a bag (then Today's round takes over). */
export function listFirstSteps(f: { stores: number; lots: number; bags: number }): FirstStep[] | null {
  if (f.bags > 0) return null;
  const steps: Omit<FirstStep, "next">[] = [
    { key: "store", title: "Add a cold store", hint: "The fridge, freezer or cold frame the bags will live in, with its boxes.", href: "/stores?add=1", needs: "store.create", done: f.stores > 0 },
    { key: "lot", title: "Add a seed lot", hint: "The species, where the seed came from and the year.", href: "/lots/edit", needs: "lot.create", done: f.lots > 0 },
    { key: "bag", title: "Set up the first bag", hint: "Seed on a damp medium, its protocol and the day it went in.", href: "/bags/new", needs: "bag.create", done: false },
    { key: "label", title: "Print its label", hint: "The code you scan at the fridge, the pull window and pencil boxes.", href: "/labels", needs: "bag.create", done: false },
  ];
  const firstOpen = steps.findIndex((s) => !s.done);
  return steps.map((s, i) => ({ ...s, next: i === firstOpen }));
}
