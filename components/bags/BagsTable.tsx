"use client";

import Link from "next/link";
import { useMemo, useState } from "react";
import {
  createColumnHelper,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from "@tanstack/react-table";
import { bagStates, vocabularyLabels, type BagState } from "@/lib/schemas/words";
import { buttonClass } from "@/components/ui/Button";
import { Chip } from "@/components/ui/Chip";
import { Input, Select } from "@/components/ui/Field";
import { PageHeader } from "@/components/ui/Card";
import { StateBadge } from "@/components/ui/StateBadge";
import {
  bagSortKeys,
  bagSortLabels,
  buildBagRows,
  compareBagRows,
  countByState,
  defaultBagFilters,
  describeRowWindow,
  emptyBagFilters,
  filterBagRows,
  toggleChip,
  windowFilterLabels,
  windowFilters,
  type BagFilters,
  type BagRow,
  type BagSortKey,
} from "@/lib/domain/rows/bag-rows";
import { formatShortDay } from "./format-day";
import { useBagSources, useToday } from "./use-farm-rows";
import { useMember } from "@/components/season/use-member";

const col = createColumnHelper<BagRow>();

// Each column sorts with the tested comparator from bag-rows.ts; tanstack keeps the sort state and direction.
const tableOrder: BagSortKey[] = ["code", "state", "species", "store", "window", "started"];
const columns = tableOrder.map((key) =>
  // An accessor (not a display column): tanstack only sorts columns that have one.
  col.accessor((r) => r.code, {
    id: key,
    header: bagSortLabels[key],
    enableSorting: true,
    sortingFn: (a, b) => compareBagRows(key, a.original, b.original),
  }),
);

function viewHref(id: string) {
  return `/bags/view?id=${encodeURIComponent(id)}`;
}

function ChipRow({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div role="group" aria-label={label} className="space-y-1">
      <p className="text-label font-semibold text-ink-soft">{label}</p>
      {/* Chips wrap onto a second line rather than scroll: none is ever hidden off the edge. */}
      <div className="flex flex-wrap gap-2 pb-1">{children}</div>
    </div>
  );
}

export function BagsTable() {
  const sources = useBagSources(true);
  const today = useToday();
  const canCreate = useMember().can("bag.create");
  const [filters, setFilters] = useState<BagFilters>(defaultBagFilters);
  const [sorting, setSorting] = useState<SortingState>([{ id: "window", desc: false }]);
  const [showFilters, setShowFilters] = useState(false);

  // Effective windows: moved by the cold each bag lost up to now, the same rows Today's round is built from.
  const allRows = useMemo(() => (sources ? buildBagRows(sources, today, { asOf: Date.now() }) : []), [sources, today]);
  const rows = useMemo(() => filterBagRows(allRows, filters, today), [allRows, filters, today]);
  const stateCounts = useMemo(() => countByState(allRows), [allRows]);
  // A search that finds bags only in states the chips hide says so, with one tap to show them.
  const hiddenMatches = useMemo(
    () => (filters.text.trim() && filters.states.length ? filterBagRows(allRows, { ...filters, states: [] }, today).length - rows.length : 0),
    [allRows, filters, rows.length, today],
  );
  const speciesList = useMemo(() => [...new Set(allRows.map((r) => r.species))].sort(), [allRows]);
  const stores = sources?.stores ?? [];

  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    enableSortingRemoval: false,
    getRowId: (r) => r.id,
  });
  const sortKey = (sorting[0]?.id ?? "window") as BagSortKey;
  const sortDesc = sorting[0]?.desc ?? false;
  const activeFilterCount =
    (filters.storeIds.length ? 1 : 0) + (filters.species.length ? 1 : 0) + (filters.window ? 1 : 0);

  if (!sources) return <p className="p-4 text-body text-ink-soft">Opening the bags on this phone…</p>;

  const sortedRows = table.getRowModel().rows.map((r) => r.original);
  return (
    <div className="mx-auto max-w-5xl px-4 pb-28 pt-4">
      <PageHeader
        title="Bags"
        subtitle={`${rows.length} of ${allRows.length} bags shown`}
        action={
          canCreate ? (
            <Link href="/bags/new" className={buttonClass("primary", "md")}>
              <span aria-hidden="true">+</span> New bag
            </Link>
          ) : null
        }
      />

      <div className="space-y-3">
        <label className="block">
          <span className="sr-only">Search bags</span>
          <Input
            type="search"
            inputMode="search"
            placeholder="Search code, species, store or box"
            value={filters.text}
            onChange={(e) => setFilters((f) => ({ ...f, text: e.target.value }))}
          />
        </label>

        {hiddenMatches > 0 ? (
          <p role="status" className="flex flex-wrap items-center gap-2 rounded-card bg-wheat-100 p-3 text-label">
            {hiddenMatches} more {hiddenMatches === 1 ? "bag matches" : "bags match"} in states not shown (sown or discarded).
            <button type="button" className={buttonClass("quiet", "md")} onClick={() => setFilters((f) => ({ ...f, states: [] }))}>
              Show all states
            </button>
          </p>
        ) : null}

        <ChipRow label="State">
          {bagStates.map((s: BagState) => (
            <Chip key={s} pressed={filters.states.includes(s)} onClick={() => setFilters((f) => ({ ...f, states: toggleChip(f.states, s) }))}>
              {vocabularyLabels.bagState[s]} <span className="font-normal">({stateCounts[s]})</span>
            </Chip>
          ))}
        </ChipRow>

        <div className="flex flex-wrap items-end gap-2">
          <button
            type="button"
            className={buttonClass("quiet", "md")}
            aria-expanded={showFilters}
            aria-controls="bag-more-filters"
            onClick={() => setShowFilters((v) => !v)}
          >
            {showFilters ? "Fewer filters" : "More filters"}
            {activeFilterCount ? <span className="rounded-full bg-glacier-700 px-2 text-white">{activeFilterCount}</span> : null}
          </button>
          {filters !== defaultBagFilters ? (
            <button type="button" className={buttonClass("quiet", "md")} onClick={() => setFilters(defaultBagFilters)}>
              Reset
            </button>
          ) : null}
        </div>

        <div className="flex items-center gap-2 md:hidden">
          <label className="flex min-w-0 flex-1 items-center">
            <Select value={sortKey} onChange={(e) => setSorting([{ id: e.target.value, desc: sortDesc }])} aria-label="Sort bags by">
              {bagSortKeys.map((k) => (
                <option key={k} value={k}>
                  Sort: {bagSortLabels[k]}
                </option>
              ))}
            </Select>
          </label>
          <button
            type="button"
            className={buttonClass("quiet", "md")}
            onClick={() => setSorting([{ id: sortKey, desc: !sortDesc }])}
            aria-label={sortDesc ? "Sorted descending; sort ascending" : "Sorted ascending; sort descending"}
          >
            <span aria-hidden="true">{sortDesc ? "↓" : "↑"}</span>
          </button>
        </div>

        {showFilters ? (
          <div id="bag-more-filters" className="space-y-3 rounded-card border border-rime-200 bg-paper p-3">
            <ChipRow label="Pull window">
              {windowFilters.map((w) => (
                <Chip key={w} pressed={filters.window === w} onClick={() => setFilters((f) => ({ ...f, window: f.window === w ? null : w }))}>
                  {windowFilterLabels[w]}
                </Chip>
              ))}
            </ChipRow>
            <ChipRow label="Cold store">
              {stores.map((s) => (
                <Chip key={s.id} pressed={filters.storeIds.includes(s.id)} onClick={() => setFilters((f) => ({ ...f, storeIds: toggleChip(f.storeIds, s.id) }))}>
                  {s.name}
                </Chip>
              ))}
            </ChipRow>
            <ChipRow label="Species">
              {speciesList.map((sp) => (
                <Chip key={sp} pressed={filters.species.includes(sp)} onClick={() => setFilters((f) => ({ ...f, species: toggleChip(f.species, sp) }))}>
                  <i>{sp}</i>
                </Chip>
              ))}
            </ChipRow>
            <button type="button" className={buttonClass("quiet", "md")} onClick={() => setFilters({ ...emptyBagFilters, text: filters.text })}>
              Show every bag
            </button>
          </div>
        ) : null}
      </div>

      {sortedRows.length === 0 ? (
        <p className="mt-6 rounded-card bg-paper p-4 text-body text-ink-soft">
          {allRows.length === 0 ? "No bags yet on this phone." : "No bag matches these filters."}
        </p>
      ) : null}

      {/* Narrow screens: one stacked card per bag, the whole card is the tap target. */}
      <ul className="mt-4 space-y-2 md:hidden" aria-label="Bags">
        {sortedRows.map((r) => (
          <li key={r.id}>
            <Link href={viewHref(r.id)} className="block rounded-card border border-rime-200 bg-paper p-3 shadow-sm active:bg-rime-100">
              <div className="flex items-start justify-between gap-2">
                <span className="font-mono text-title font-bold tracking-wide text-glacier-800">{r.codeShown}</span>
                <StateBadge state={r.state} />
              </div>
              <p className="mt-1 text-body">
                <i>{r.species}</i>
                {r.commonName ? <span className="text-ink-soft"> · {r.commonName}</span> : null}
              </p>
              <p className="text-label text-ink-soft">
                {r.storeName}
                {r.box ? ` · ${r.box}` : ""} · {describeRowWindow(r, formatShortDay)}
              </p>
            </Link>
          </li>
        ))}
      </ul>

      {/* Wide screens: a real table with sortable headers. */}
      {sortedRows.length ? (
        <table className="mt-4 hidden w-full border-collapse overflow-hidden rounded-card bg-paper text-left text-body shadow-sm md:table">
          <thead className="bg-rime-100 text-label">
            <tr>
              {table.getHeaderGroups()[0].headers.map((h) => {
                const dir = h.column.getIsSorted();
                return (
                  <th key={h.id} scope="col" aria-sort={dir === "asc" ? "ascending" : dir === "desc" ? "descending" : "none"} className="p-0">
                    <button type="button" onClick={h.column.getToggleSortingHandler()} className="flex min-h-tap w-full items-center gap-1 px-3 font-semibold text-ink hover:bg-rime-200">
                      {bagSortLabels[h.id as BagSortKey]}
                      <span aria-hidden="true" className="text-glacier-600">
                        {dir === "asc" ? "▲" : dir === "desc" ? "▼" : "↕"}
                      </span>
                    </button>
                  </th>
                );
              })}
            </tr>
          </thead>
          <tbody>
            {sortedRows.map((r) => (
              <tr key={r.id} className="border-t border-rime-200 hover:bg-rime-50">
                <td className="px-3 py-2">
                  <Link href={viewHref(r.id)} className="font-mono font-bold text-glacier-700 underline underline-offset-4">
                    {r.codeShown}
                  </Link>
                </td>
                <td className="px-3 py-2">
                  <StateBadge state={r.state} />
                </td>
                <td className="px-3 py-2">
                  <i>{r.species}</i>
                  {r.commonName ? <span className="block text-label text-ink-soft">{r.commonName}</span> : null}
                </td>
                <td className="px-3 py-2">
                  {r.storeName}
                  {r.box ? <span className="block text-label text-ink-soft">{r.box}</span> : null}
                </td>
                <td className="px-3 py-2">{describeRowWindow(r, formatShortDay)}</td>
                <td className="px-3 py-2">{r.startedOn ? formatShortDay(r.startedOn) : r.plannedStartOn ? `Planned ${formatShortDay(r.plannedStartOn)}` : "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
    </div>
  );
}
