"use client";

import { useEffect, useId, useRef, useState } from "react";
import { Button } from "./Button";

/**
 * An in-page confirmation for something that cannot be undone: says what will happen, then a big
 * danger button and a way back. Takes focus when it opens so a screen reader reads it out.
 */
export function ConfirmPanel({
  title,
  children,
  confirmLabel,
  cancelLabel = "Keep it",
  busy = false,
  onConfirm,
  onCancel,
}: {
  title: string;
  children: React.ReactNode;
  confirmLabel: string;
  cancelLabel?: string;
  busy?: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  const id = useId();
  const heading = useRef<HTMLHeadingElement>(null);
  useEffect(() => {
    heading.current?.focus();
    heading.current?.scrollIntoView?.({ block: "nearest" });
  }, []);
  return (
    <section role="alertdialog" aria-labelledby={`${id}-title`} aria-describedby={`${id}-body`} className="space-y-3 rounded-card border-2 border-ember-600 bg-ember-100 p-4">
      <h3 id={`${id}-title`} ref={heading} tabIndex={-1} className="text-body font-bold text-ember-700 outline-none">
        {title}
      </h3>
      <div id={`${id}-body`} className="space-y-2 text-label text-ink">
        {children}
      </div>
      <div className="flex flex-col gap-2">
        <Button tone="danger" size="lg" onClick={onConfirm} disabled={busy}>
          {confirmLabel}
        </Button>
        <Button tone="quiet" onClick={onCancel} disabled={busy}>
          {cancelLabel}
        </Button>
      </div>
    </section>
  );
}

/**
 * State for an action behind a confirmation: open/close, busy while it runs, and its failure in words
 * (`describe` turns the error into a sentence; on success `after` runs, e.g. leaving the page).
 */
export function useConfirmedAction(action: () => Promise<unknown>, after: () => void, describe: (e: unknown) => string) {
  const [open, setOpen] = useState(false);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  async function run() {
    setBusy(true);
    setError(null);
    try {
      await action();
      after();
    } catch (e) {
      setError(describe(e));
      setBusy(false);
    }
  }
  return {
    open,
    busy,
    error,
    show: () => setOpen(true),
    cancel: () => {
      setOpen(false);
      setError(null);
    },
    run: () => void run(),
  };
}
