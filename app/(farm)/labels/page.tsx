import type { Metadata } from "next";
import { Suspense } from "react";
import { LabelSheet } from "@/components/labels/LabelSheet";

export const metadata: Metadata = { title: "Labels" };

// ?ids=a,b,c preselects bags (e.g. from a new bag or the bags table); ?store= and ?size=small|large|a4 also work.
export default function LabelsPage() {
  return (
    <div className="mx-auto w-full min-w-0 max-w-3xl px-4 py-5">
      <Suspense>
        <LabelSheet />
      </Suspense>
    </div>
  );
}
