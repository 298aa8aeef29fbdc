import type { Metadata } from "next";
import { Suspense } from "react";
import { Scanner } from "@/components/scan/Scanner";

export const metadata: Metadata = { title: "Scan" };

export default function ScanPage() {
  return (
    <div className="mx-auto max-w-xl px-4 py-5">
      <Suspense>
        <Scanner />
      </Suspense>
    </div>
  );
}
