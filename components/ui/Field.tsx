import { forwardRef, type InputHTMLAttributes, type SelectHTMLAttributes, type TextareaHTMLAttributes } from "react";

const control =
  "block w-full min-h-tap rounded-xl border-2 border-rime-300 bg-paper px-3 py-2 text-body text-ink placeholder:text-pencil focus:border-glacier-500 aria-[invalid=true]:border-ember-600";

/** A labelled control with its error in words, wired for screen readers. */
export function Field({ label, htmlFor, error, hint, children }: { label: string; htmlFor: string; error?: string; hint?: string; children: React.ReactNode }) {
  return (
    <div className="space-y-1">
      <label htmlFor={htmlFor} className="block text-label font-semibold text-ink">
        {label}
      </label>
      {children}
      {hint && !error ? <p className="text-label text-ink-soft">{hint}</p> : null}
      {error ? (
        <p id={`${htmlFor}-error`} role="alert" className="text-label font-medium text-ember-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}

export const Input = forwardRef<HTMLInputElement, InputHTMLAttributes<HTMLInputElement>>(function Input({ className = "", ...rest }, ref) {
  return <input ref={ref} className={`${control} ${className}`} {...rest} />;
});

export const Select = forwardRef<HTMLSelectElement, SelectHTMLAttributes<HTMLSelectElement>>(function Select({ className = "", ...rest }, ref) {
  return <select ref={ref} className={`${control} ${className}`} {...rest} />;
});

export const TextArea = forwardRef<HTMLTextAreaElement, TextareaHTMLAttributes<HTMLTextAreaElement>>(function TextArea({ className = "", ...rest }, ref) {
  return <textarea ref={ref} className={`${control} min-h-24 ${className}`} {...rest} />;
});
