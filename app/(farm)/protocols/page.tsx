import type { Metadata } from "next";
import { ProtocolLibrary } from "@/components/protocols/ProtocolLibrary";

export const metadata: Metadata = { title: "Protocols" };

export default function ProtocolsPage() {
  return <ProtocolLibrary />;
}
