import type { Metadata } from "next";
import { TodayRound } from "@/components/today/TodayRound";

export const metadata: Metadata = { title: "Today" };

export default function TodayPage() {
  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl px-4 py-5">
      <TodayRound />
    </div>
  );
}
