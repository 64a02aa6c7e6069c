import type { JSX } from "react";
import type { UnitChoice } from "../../lib/domain/units.ts";
import type { Roster as RosterData, RosterRow } from "../../lib/motors/types.ts";
import Ring from "../ui/Ring.tsx";
import { formatDate, formatOrDash } from "./motors-api.ts";
import UsageBar from "./UsageBar.tsx";

// The roster's rows: a sortable table on wide screens, cards on a phone.

export type SignalCounts = Record<string, { watch: number; act: number }>;

const COLUMNS: { key: string | null; label: string }[] = [
  { key: "name", label: "Engine" },
  { key: "status", label: "Status" },
  { key: "chassis", label: "Chassis" },
  { key: "topEndShare", label: "Since top end" },
  { key: "bottomEndShare", label: "Since bottom end" },
  { key: null, label: "Latest ratio" },
  { key: null, label: "Squish" },
  { key: null, label: "Signals" },
];

function SignalCell({ row, counts }: { row: RosterRow; counts: SignalCounts | undefined }): JSX.Element {
  const c = counts?.[String(row.id)];
  if (!counts) return <span className="text-pencil">…</span>;
  if (!c || c.act + c.watch === 0) return <span className="text-pencil">none open</span>;
  return (
    <a href={`/motors/${row.id}#signals`} className="inline-flex items-center gap-2 no-underline" data-testid="roster-signals">
      {c.act ? (
        <span className="inline-flex items-center gap-1 font-semibold">
          <Ring level="act" size={16} />
          {c.act}
        </span>
      ) : null}
      {c.watch ? (
        <span className="inline-flex items-center gap-1 font-semibold">
          <Ring level="watch" size={16} />
          {c.watch}
        </span>
      ) : null}
      <span className="sr-only">open signals</span>
    </a>
  );
}

function LatestCell({ row, units }: { row: RosterRow; units: UnitChoice }): JSX.Element {
  const r = row.latestReading;
  if (!r) return <span className="text-pencil">no readings</span>;
  return (
    <span className="rl-num">
      <span className="font-semibold">{formatOrDash("ratio", r.maxGeometricRatio, units)}</span>
      <span className="block text-xs text-pencil">
        geometric{r.maxTrappedRatio !== null ? `, trapped ${r.maxTrappedRatio.toFixed(2)}:1` : ""} · {formatDate(r.takenOn, false)}
      </span>
    </span>
  );
}

function ChassisCell({ row }: { row: RosterRow }): JSX.Element {
  return row.chassis ? <span>{row.chassis.kind} {row.chassis.number}</span> : <span className="text-pencil">not installed</span>;
}

export function RosterTable({ rows, counts, units, unitShort, sort, onSort, canSeeSignals }: {
  rows: RosterRow[];
  counts: SignalCounts | undefined;
  units: UnitChoice;
  unitShort: RosterData["unit"];
  sort: string;
  onSort: (key: string) => void;
  canSeeSignals: boolean;
}): JSX.Element {
  const active = sort.replace(/^-/, "");
  const desc = sort.startsWith("-");
  return (
    <table className="hidden w-full border-collapse text-left md:table" data-testid="roster-table">
      <thead>
        <tr className="border-b-hair border-ink">
          {COLUMNS.filter((c) => canSeeSignals || c.label !== "Signals").map((c) => (
            <th
              key={c.label}
              scope="col"
              className="px-2 py-2 text-sm font-semibold text-pencil first:pl-0"
              aria-sort={c.key && c.key === active ? (desc ? "descending" : "ascending") : undefined}
            >
              {c.key ? (
                <button type="button" className="inline-flex items-center gap-1 font-semibold hover:text-ink" onClick={() => onSort(c.key as string)}>
                  {c.label}
                  <span aria-hidden="true" className="w-3 text-ink">{c.key === active ? (desc ? "↓" : "↑") : ""}</span>
                </button>
              ) : (
                c.label
              )}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.id} className="border-b-hair border-rule align-top" data-testid="roster-row" data-engine={r.name}>
            <td className="py-2.5 pr-2">
              <a href={`/motors/${r.id}`} className="font-semibold">{r.name}</a>
              <span className="block text-xs text-pencil">{[r.serial, r.racingClass?.name].filter(Boolean).join(" · ") || `${r.cylinders} cyl.`}</span>
            </td>
            <td className="px-2 py-2.5"><Ring status={r.status} size={16} label /></td>
            <td className="px-2 py-2.5"><ChassisCell row={r} /></td>
            <td className="px-2 py-2.5"><UsageBar compact label="Since top end" counter={r.counters.topEnd} unit={unitShort} /></td>
            <td className="px-2 py-2.5"><UsageBar compact label="Since bottom end" counter={r.counters.bottomEnd} unit={unitShort} /></td>
            <td className="px-2 py-2.5"><LatestCell row={r} units={units} /></td>
            <td className="rl-num px-2 py-2.5">{formatOrDash("squish", r.latestReading?.minSquishMeanMm, units)}</td>
            {canSeeSignals ? <td className="px-2 py-2.5"><SignalCell row={r} counts={counts} /></td> : null}
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function RosterCards({ rows, counts, units, unitShort, canSeeSignals }: {
  rows: RosterRow[];
  counts: SignalCounts | undefined;
  units: UnitChoice;
  unitShort: RosterData["unit"];
  canSeeSignals: boolean;
}): JSX.Element {
  return (
    <ul className="divide-y divide-rule border-y-hair border-rule md:hidden" data-testid="roster-cards">
      {rows.map((r) => (
        <li key={r.id} className="py-3" data-testid="roster-card" data-engine={r.name}>
          <div className="flex items-baseline justify-between gap-3">
            <a href={`/motors/${r.id}`} className="text-lg font-semibold">{r.name}</a>
            <Ring status={r.status} size={16} label />
          </div>
          <p className="text-sm text-pencil"><ChassisCell row={r} />{r.racingClass ? ` · ${r.racingClass.name}` : ""}</p>
          <div className="mt-2 grid grid-cols-2 gap-3">
            <UsageBar label="Top end" counter={r.counters.topEnd} unit={unitShort} compact={false} />
            <UsageBar label="Bottom end" counter={r.counters.bottomEnd} unit={unitShort} compact={false} />
          </div>
          <div className="mt-2 flex flex-wrap items-start justify-between gap-x-4 gap-y-1 text-sm">
            <LatestCell row={r} units={units} />
            <span className="rl-num">squish {formatOrDash("squish", r.latestReading?.minSquishMeanMm, units)}</span>
            {canSeeSignals ? <SignalCell row={r} counts={counts} /> : null}
          </div>
        </li>
      ))}
    </ul>
  );
}
