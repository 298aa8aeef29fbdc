import type { Metadata } from "next";
import { Suspense } from "react";
import { LotForm } from "@/components/lots/LotForm";

export const metadata: Metadata = { title: "Seed lot" };

// New lot at /lots/edit, an existing one at /lots/edit?id=… (one static route, so it opens offline).
export default function LotEditPage() {
  return (
    <Suspense>
      <LotForm />
    </Suspense>
  );
}
