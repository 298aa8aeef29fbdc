"use client";

import Link from "next/link";
import { useMember } from "@/components/season/use-member";
import { buttonClass } from "@/components/ui/Button";
import type { FirstStep } from "./first-steps";

// An empty farm's Today: the first steps in order, each with its button; the next one is the solid button.
export function FirstSteps({ steps }: { steps: FirstStep[] }) {
  const { can } = useMember();
  const mayBuild = steps.every((s) => can(s.needs));
  return (
    <section aria-labelledby="first-steps" className="space-y-3" data-testid="first-steps">
      <h2 id="first-steps" className="text-title font-bold text-glacier-800">
        First steps on this farm
      </h2>
      {!mayBuild ? (
        <p className="text-label text-ink-soft">Your role on this farm records checks; a Grower or the Owner sets up stores, seed lots and bags.</p>
      ) : null}
      <ol className="space-y-2">
        {steps.map((s, i) => (
          <li key={s.key} className={`rounded-card border-2 bg-paper p-3 ${s.next ? "border-glacier-600" : "border-rime-200"}`} data-done={s.done}>
            <p className="flex items-baseline gap-2 font-semibold text-ink">
              <span aria-hidden="true" className={`inline-flex h-7 w-7 shrink-0 items-center justify-center rounded-full text-label ${s.done ? "bg-moss-600 text-white" : "border-2 border-glacier-600 text-glacier-700"}`}>
                {s.done ? "✓" : i + 1}
              </span>
              <span>
                {s.title}
                {s.done ? <span className="font-normal text-moss-700"> · done</span> : null}
              </span>
            </p>
            <p className="mt-1 pl-9 text-label text-ink-soft">{s.hint}</p>
            {!s.done && can(s.needs) && (s.key !== "label" || s.next) ? (
              <Link href={s.href} className={`${buttonClass(s.next ? "primary" : "quiet", "md")} mt-2 ml-9`}>
                {s.title}
              </Link>
            ) : null}
          </li>
        ))}
      </ol>
    </section>
  );
}
