import { Button } from "./Button";

/** The foot of a form: why it was not saved (when it was not), the submit button and a way out. */
export function FormActions({ error, submitLabel, busy, onCancel }: { error: string | null; submitLabel: string; busy: boolean; onCancel: () => void }) {
  return (
    <>
      {error ? (
        <p role="alert" className="text-label font-medium text-ember-700">
          {error}
        </p>
      ) : null}
      <div className="flex gap-3">
        <Button type="submit" className="flex-1" disabled={busy}>
          {submitLabel}
        </Button>
        <Button tone="quiet" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </>
  );
}
