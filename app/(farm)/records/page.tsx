import type { Metadata } from "next";
import { RecordsScreen } from "@/components/records/RecordsScreen";

export const metadata: Metadata = { title: "Records" };

export default function RecordsPage() {
  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl px-4 pb-28 pt-4">
      <RecordsScreen />
    </div>
  );
}
