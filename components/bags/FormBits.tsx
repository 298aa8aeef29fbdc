import { media, vocabularyLabels } from "@/lib/schemas/words";

/** A save that did not happen, in words (from describeSaveError). */
export function SaveError({ message }: { message: string | null }) {
  if (!message) return null;
  return (
    <p role="alert" className="rounded-card bg-ember-100 p-3 text-body text-ember-700">
      {message}
    </p>
  );
}

/** The media a bag can sit in, as select options. */
export function MediumOptions() {
  return (
    <>
      {media.map((m) => (
        <option key={m} value={m}>
          {vocabularyLabels.medium[m]}
        </option>
      ))}
    </>
  );
}
