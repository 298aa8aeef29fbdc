"use client";

import { useMemo } from "react";
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable } from "@tanstack/react-table";
import type { ArmComparison, ArmResult, TrialTable } from "./trial-table";

const pct = (x: number) => `${(100 * x).toFixed(0)} %`;
const points = (x: number) => `${x >= 0 ? "+" : "−"}${Math.abs(100 * x).toFixed(1)}`;
const formatP = (p: number) => (p < 0.001 ? "< 0.001" : p.toFixed(3));

interface Row {
  arm: ArmResult;
  vsBest: ArmComparison | null;
  isBest: boolean;
}

const col = createColumnHelper<Row>();
const columns = [
  col.display({
    id: "arm",
    header: "Arm",
    cell: ({ row: { original: r } }) => (
      <span className="font-semibold">
        {r.arm.arm.label}
        {r.isBest ? <span className="block text-label font-medium text-ink-soft">most came up</span> : null}
      </span>
    ),
  }),
  col.display({
    id: "germ",
    header: "Germinated",
    cell: ({ row: { original: r } }) => (r.arm.sown ? `${r.arm.germinated}/${r.arm.sown} · ${pct(r.arm.germinated / r.arm.sown)}` : "not counted"),
  }),
  col.display({
    id: "wilson",
    header: "95 % interval (Wilson)",
    cell: ({ row: { original: r } }) => (r.arm.interval ? `${pct(r.arm.interval.lower)}–${pct(r.arm.interval.upper)}` : "—"),
  }),
  col.display({
    id: "diff",
    header: "Best minus this (Newcombe 95 %), points",
    cell: ({ row: { original: r } }) => {
      if (r.isBest) return "reference";
      if (!r.vsBest) return "—";
      const d = r.vsBest.verdict.difference;
      return `${points(d.difference)} (${points(d.lower)} to ${points(d.upper)})`;
    },
  }),
  col.display({
    id: "fisher",
    header: "Fisher's exact p (two-sided)",
    cell: ({ row: { original: r } }) => (r.vsBest ? formatP(r.vsBest.verdict.fisher.pTwoSided) : "—"),
  }),
];

/** Each arm with its Wilson interval; the best arm against every other: Newcombe interval and Fisher's exact p. */
export function ComparisonTable({ table }: { table: TrialTable }) {
  // The table's data must keep its identity between renders: a fresh array each render makes the table reset its
  // page on every render, which renders again, and the screen locks up at the first tap.
  const data: Row[] = useMemo(
    () =>
      table.arms.map((arm) => ({
        arm,
        vsBest: table.comparisons.find((c) => c.armId === arm.arm.id) ?? null,
        isBest: table.best?.arm.id === arm.arm.id && table.comparisons.length > 0,
      })),
    [table],
  );
  const t = useReactTable({ data, columns, getCoreRowModel: getCoreRowModel() });
  return (
    <>
      {/* Phones: one card per arm, each value under its column's name. */}
      <ul className="space-y-2 sm:hidden" aria-label="Germination by arm">
        {t.getRowModel().rows.map((r) => (
          <li key={r.id} className="rounded-xl border border-rime-200 bg-paper p-3">
            <dl className="space-y-1 text-label">
              {r.getVisibleCells().map((c) => (
                <div key={c.id} className={c.column.id === "arm" ? "text-body" : "flex justify-between gap-3"}>
                  {c.column.id === "arm" ? null : <dt className="text-ink-soft">{String(c.column.columnDef.header)}</dt>}
                  <dd className={c.column.id === "arm" ? "" : "text-right font-semibold text-ink"}>{flexRender(c.column.columnDef.cell, c.getContext())}</dd>
                </div>
              ))}
            </dl>
          </li>
        ))}
      </ul>
      <div className="hidden overflow-x-auto rounded-xl border border-rime-200 sm:block">
        <table className="w-full text-left text-label">
          <caption className="sr-only">Germination by arm, with intervals and the comparison against the best arm</caption>
          <thead className="bg-rime-100">
            {t.getHeaderGroups().map((g) => (
              <tr key={g.id}>
                {g.headers.map((h) => (
                  <th key={h.id} scope="col" className="px-2 py-2 align-bottom font-semibold">
                    {flexRender(h.column.columnDef.header, h.getContext())}
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody>
            {t.getRowModel().rows.map((r) => (
              <tr key={r.id} className="border-t border-rime-100 bg-paper">
                {r.getVisibleCells().map((c) => (
                  <td key={c.id} className="px-2 py-2 align-top">
                    {flexRender(c.column.columnDef.cell, c.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </>
  );
}
