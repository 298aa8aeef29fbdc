import type { Metadata } from "next";
import { Suspense } from "react";
import { CheckSheet } from "@/components/check/CheckSheet";

export const metadata: Metadata = { title: "Check a bag" };

// One static page for every bag (?bag=ID or ?code=CODE from a label), so it is precached and opens offline.
export default function CheckPage() {
  return (
    <div className="mx-auto max-w-xl px-4 py-5">
      <Suspense>
        <CheckSheet />
      </Suspense>
    </div>
  );
}
