import type { CsvRowReport } from "@/lib/domain/csv";

/** Rows that need attention first, then a count of the fine ones; row numbers as a spreadsheet shows them. */
export function ImportRowReport({ rows, limit = 50 }: { rows: readonly CsvRowReport[]; limit?: number }) {
  const flagged = rows.filter((r) => r.status !== "ok");
  if (flagged.length === 0) return rows.length ? <p className="text-label text-moss-700">Every row reads well.</p> : null;
  return (
    <div className="max-h-64 overflow-auto rounded-lg border border-rime-200 bg-paper">
      <table className="w-full text-left text-label">
        <caption className="sr-only">Rows with a problem</caption>
        <thead className="sticky top-0 bg-rime-100">
          <tr>
            <th scope="col" className="px-2 py-1">Row</th>
            <th scope="col" className="px-2 py-1">What we found</th>
          </tr>
        </thead>
        <tbody>
          {flagged.slice(0, limit).map((r) => (
            <tr key={r.row} className="border-t border-rime-100 align-top">
              <td className="px-2 py-1 font-semibold">{r.row}</td>
              <td className={`px-2 py-1 ${r.status === "error" ? "text-ember-700" : "text-ink-soft"}`}>
                {r.status === "duplicate" ? "Repeated: " : ""}
                {r.message}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {flagged.length > limit ? <p className="px-2 py-1 text-label text-ink-soft">…and {flagged.length - limit} more.</p> : null}
    </div>
  );
}
