"use client";

/** A row of big radio buttons (one choice of a few), labelled as a group. Gloved thumbs: every option ≥ 56 px high. */
export function Segmented<T extends string>({
  legend,
  name,
  options,
  value,
  onChange,
  tone,
}: {
  legend: string;
  name: string;
  options: readonly { value: T; label: string }[];
  value: T;
  onChange: (value: T) => void;
  /** Colour of the chosen option for each value (e.g. "good" for the right answer). */
  tone?: (value: T) => "good" | "attention" | "danger" | "neutral";
}) {
  const chosen = { good: "border-moss-600 bg-moss-100 text-moss-700", attention: "border-wheat-600 bg-wheat-100 text-wheat-700", danger: "border-ember-600 bg-ember-100 text-ember-700", neutral: "border-glacier-700 bg-rime-200 text-glacier-800" };
  return (
    <fieldset className="space-y-1">
      <legend className="text-label font-semibold text-ink">{legend}</legend>
      <div className="grid gap-2" style={{ gridTemplateColumns: `repeat(${options.length}, minmax(0, 1fr))` }}>
        {options.map((o) => {
          const checked = o.value === value;
          return (
            <label
              key={o.value}
              className={`flex min-h-14 cursor-pointer items-center justify-center rounded-card border-2 px-2 py-2 text-center text-label font-semibold leading-tight has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-glacier-500 ${
                checked ? chosen[tone?.(o.value) ?? "neutral"] : "border-rime-300 bg-paper text-ink"
              }`}
            >
              <input type="radio" className="sr-only" name={name} value={o.value} checked={checked} onChange={() => onChange(o.value)} />
              {checked ? <span aria-hidden="true" className="mr-1">●</span> : null}
              {o.label}
            </label>
          );
        })}
      </div>
    </fieldset>
  );
}
