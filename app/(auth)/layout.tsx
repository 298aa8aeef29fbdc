import Link from "next/link";
import { RimeMark } from "@/components/ui/RimeMark";

// The signed-out screens: one calm column, big targets, the mark at the top.
export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col gap-6 px-5 py-8">
      <Link href="/" className="flex min-h-tap items-center gap-3 self-start" aria-label="Rimebook home">
        <RimeMark className="h-10 w-10" />
        <span className="text-title font-bold tracking-tight text-glacier-800">Rimebook</span>
      </Link>
      {children}
    </main>
  );
}
