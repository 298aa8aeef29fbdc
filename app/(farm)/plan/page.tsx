import type { Metadata } from "next";
import { PlanScreen } from "@/components/plan/PlanScreen";

export const metadata: Metadata = { title: "Season plan" };

export default function PlanPage() {
  return <PlanScreen />;
}
