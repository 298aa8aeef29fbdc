// "How this is worked out": the formulas, sources and assumptions behind a number, folded under the number so
// a long page stays short (still in the page for anyone who wants them, and for screen readers and tests).
export function WorkedOut({ children, testId }: { children: React.ReactNode; testId?: string }) {
  return (
    <details className="rounded-card border border-dashed border-rime-300 text-label text-ink-soft open:pb-3" data-testid={testId}>
      <summary className="flex min-h-tap cursor-pointer items-center px-3 font-semibold text-glacier-700">How this is worked out</summary>
      <div className="space-y-1 px-3">{children}</div>
    </details>
  );
}
