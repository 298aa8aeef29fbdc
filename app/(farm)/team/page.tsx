import type { Metadata } from "next";
import { TeamPanel } from "@/components/team/TeamPanel";

export const metadata: Metadata = { title: "Team" };

export default function TeamPage() {
  return (
    <div className="mx-auto max-w-xl lg:max-w-4xl px-4 py-5">
      <TeamPanel />
    </div>
  );
}
