import { forwardRef, type ButtonHTMLAttributes } from "react";

type Tone = "primary" | "secondary" | "quiet" | "danger" | "danger-outline" | "good";
type Size = "md" | "lg" | "xl";

const tones: Record<Tone, string> = {
  primary: "bg-glacier-700 text-white hover:bg-glacier-800 disabled:bg-rime-300",
  secondary: "border-2 border-glacier-700 bg-paper text-glacier-700 hover:bg-rime-100 disabled:border-rime-300 disabled:text-rime-300",
  quiet: "bg-rime-100 text-ink hover:bg-rime-200 disabled:text-rime-300",
  danger: "bg-ember-600 text-white hover:bg-ember-700 disabled:bg-rime-300",
  // A destructive step offered beside others: looks destructive without shouting.
  "danger-outline": "border-2 border-ember-600 bg-paper text-ember-700 hover:bg-ember-100 disabled:border-rime-300 disabled:text-rime-300",
  good: "bg-moss-600 text-white hover:bg-moss-700 disabled:bg-rime-300",
};
const sizes: Record<Size, string> = {
  md: "min-h-tap px-4 py-2 text-body",
  lg: "min-h-14 px-5 py-3 text-title",
  xl: "min-h-20 px-6 py-4 text-title", // the one-tap "All good": big enough for a gloved thumb
};

export function buttonClass(tone: Tone = "primary", size: Size = "md", extra = "") {
  return `inline-flex items-center justify-center gap-2 rounded-card font-semibold transition-colors disabled:cursor-not-allowed ${tones[tone]} ${sizes[size]} ${extra}`;
}

export const Button = forwardRef<HTMLButtonElement, ButtonHTMLAttributes<HTMLButtonElement> & { tone?: Tone; size?: Size }>(
  function Button({ tone = "primary", size = "md", className = "", type = "button", ...rest }, ref) {
    return <button ref={ref} type={type} className={buttonClass(tone, size, className)} {...rest} />;
  },
);
