/** A short message under a form: an alert when something went wrong, a status when it worked. */
export function Notice({ ok = false, children, className = "" }: { ok?: boolean; children: React.ReactNode; className?: string }) {
  if (children === null || children === undefined || children === false || children === "") return null;
  return (
    <p role={ok ? "status" : "alert"} className={`text-label font-medium ${ok ? "text-moss-700" : "text-ember-700"} ${className}`}>
      {children}
    </p>
  );
}
