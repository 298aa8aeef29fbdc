import type { HTMLAttributes } from "react";

export function Card({ className = "", ...rest }: HTMLAttributes<HTMLDivElement>) {
  return <div className={`tag relative rounded-card border border-rime-300 bg-paper p-4 ${className}`} {...rest} />;
}

export function PageHeader({ title, subtitle, action }: { title: string; subtitle?: string; action?: React.ReactNode }) {
  return (
    <header className="mb-4 flex items-start justify-between gap-3">
      <div>
        <h1 className="text-title font-bold text-glacier-800">{title}</h1>
        {subtitle ? <p className="text-label text-ink-soft">{subtitle}</p> : null}
      </div>
      {action}
    </header>
  );
}
