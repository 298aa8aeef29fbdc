import type { Metadata } from "next";
import { RecordsScreen } from "@/components/records/RecordsScreen";

export const metadata: Metadata = { title: "Records" };

export default function RecordsPage() {
  return (
    <main className="mx-auto max-w-xl px-4 pb-28 pt-4">
      <RecordsScreen />
    </main>
  );
}
