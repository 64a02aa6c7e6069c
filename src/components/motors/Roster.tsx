import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { useEffect, useState, type JSX } from "react";
import type { UnitChoice } from "../../lib/domain/units.ts";
import type { EngineStatus, Roster as RosterData } from "../../lib/motors/types.ts";
import Ring from "../ui/Ring.tsx";
import { getJson, toQuery } from "./motors-api.ts";
import QueryRoot from "./QueryRoot.tsx";
import { RosterCards, RosterTable, type SignalCounts } from "./RosterRows.tsx";

export type { SignalCounts } from "./RosterRows.tsx";

// The Motors roster: every engine with where it is, how far into its intervals, its latest
// ratio and squish and its open signals. Filters live in the address, so a filtered roster can
// be shared and survives a reload; a table on wide screens, cards on a phone.

export interface RosterFilters {
  search: string;
  status: EngineStatus[];
  chassisId: string;
  racingClassId: string;
  sort: string;
  page: number;
}

interface Props {
  initialFilters: RosterFilters;
  initialRoster: RosterData;
  initialCounts: SignalCounts | null;
  units: UnitChoice;
  canSeeSignals: boolean;
  chassis: { id: number; number: string }[];
  racingClasses: { id: number; name: string }[];
}

const PER_PAGE = 50;
const STATUS_LABEL: Record<EngineStatus, string> = { running: "running", bench: "on the bench", spare: "spare", retired: "retired" };
const STATUSES: EngineStatus[] = ["running", "bench", "spare", "retired"];


function rosterPath(f: RosterFilters): string {
  return `/api/v1/engines${toQuery({
    search: f.search.trim(),
    status: f.status.join(","),
    chassisId: f.chassisId,
    racingClassId: f.racingClassId,
    sort: f.sort === "name" ? "" : f.sort,
    page: f.page > 1 ? f.page : "",
    perPage: PER_PAGE,
  })}`;
}

function addressOf(f: RosterFilters): string {
  return toQuery({
    search: f.search.trim(),
    status: f.status.join(","),
    chassisId: f.chassisId,
    racingClassId: f.racingClassId,
    sort: f.sort === "name" ? "" : f.sort,
    page: f.page > 1 ? f.page : "",
  });
}

function sameFilters(a: RosterFilters, b: RosterFilters): boolean {
  return addressOf(a) === addressOf(b);
}

/** Typing waits a moment before asking the server, so every keystroke is not a request. */
function useSettled<T>(value: T, ms: number): T {
  const [settled, setSettled] = useState(value);
  useEffect(() => {
    const t = window.setTimeout(() => setSettled(value), ms);
    return () => window.clearTimeout(t);
  }, [value, ms]);
  return settled;
}

function RosterView(props: Props): JSX.Element {
  const [filters, setFilters] = useState<RosterFilters>(props.initialFilters);
  const settled = useSettled(filters, 250);
  const roster = useQuery({
    queryKey: ["roster", addressOf(settled)],
    queryFn: () => getJson<RosterData>(rosterPath(settled)),
    initialData: sameFilters(settled, props.initialFilters) ? props.initialRoster : undefined,
    placeholderData: keepPreviousData,
  });
  const ids = roster.data?.engines.map((e) => e.id) ?? [];
  const counts = useQuery({
    queryKey: ["signal-counts", ids.join(",")],
    queryFn: async () => (await getJson<{ counts: SignalCounts }>(`/api/v1/motors-ui/signal-counts?engineIds=${ids.join(",")}`)).counts,
    enabled: props.canSeeSignals && ids.length > 0,
    initialData: props.initialCounts && roster.data === props.initialRoster ? props.initialCounts : undefined,
  });

  useEffect(() => {
    const search = addressOf(settled);
    if (window.location.search !== search) window.history.replaceState(window.history.state, "", `${window.location.pathname}${search}`);
  }, [settled]);

  const change = (patch: Partial<RosterFilters>): void => setFilters((f) => ({ ...f, page: 1, ...patch }));
  const toggleStatus = (s: EngineStatus): void =>
    change({ status: filters.status.includes(s) ? filters.status.filter((x) => x !== s) : [...filters.status, s] });
  const sortBy = (key: string): void => change({ sort: filters.sort === key ? `-${key}` : key });
  const data = roster.data;
  const pages = data ? Math.max(1, Math.ceil(data.total / data.perPage)) : 1;

  return (
    <div data-testid="roster">
      <form role="search" className="mb-4 grid grid-cols-3 gap-3 md:grid-cols-[minmax(12rem,1fr)_auto_auto] md:items-end" onSubmit={(e) => e.preventDefault()}>
        <div className="col-span-3 md:col-span-1">
          <label className="rl-label" htmlFor="roster-search">Search name or serial</label>
          <input id="roster-search" className="rl-field" type="search" value={filters.search} onChange={(e) => change({ search: e.target.value })} autoComplete="off" />
        </div>
        <div>
          <label className="rl-label" htmlFor="roster-chassis">Chassis</label>
          <select id="roster-chassis" className="rl-field" value={filters.chassisId} onChange={(e) => change({ chassisId: e.target.value })}>
            <option value="">any</option>
            <option value="none">not installed</option>
            {props.chassis.map((c) => <option key={c.id} value={String(c.id)}>{c.number}</option>)}
          </select>
        </div>
        <div>
          <label className="rl-label" htmlFor="roster-class">Class</label>
          <select id="roster-class" className="rl-field" value={filters.racingClassId} onChange={(e) => change({ racingClassId: e.target.value })}>
            <option value="">any</option>
            {props.racingClasses.map((c) => <option key={c.id} value={String(c.id)}>{c.name}</option>)}
          </select>
        </div>
        <div className="md:hidden">
          <label className="rl-label" htmlFor="roster-sort">Order</label>
          <select id="roster-sort" className="rl-field" value={filters.sort} onChange={(e) => change({ sort: e.target.value })}>
            <option value="name">name</option>
            <option value="status">status</option>
            <option value="chassis">chassis</option>
            <option value="-topEndShare">closest to top end</option>
            <option value="-bottomEndShare">closest to bottom end</option>
            <option value="-sinceNew">most used</option>
          </select>
        </div>
        <fieldset className="col-span-3">
          <legend className="rl-label">Status</legend>
          <div className="flex flex-wrap gap-2">
            {STATUSES.map((s) => (
              <label key={s} className={`inline-flex cursor-pointer items-center gap-2 rounded-sm border-hair px-3 py-1.5 text-sm font-semibold ${filters.status.includes(s) ? "border-ink bg-sheet" : "border-rule"}`}>
                <input type="checkbox" className="h-4 w-4 accent-current" checked={filters.status.includes(s)} onChange={() => toggleStatus(s)} />
                <Ring status={s} size={14} />
                {STATUS_LABEL[s]}
              </label>
            ))}
          </div>
        </fieldset>
      </form>

      <p className="mb-2 text-sm text-pencil" role="status" aria-live="polite" data-testid="roster-count">
        {roster.isError
          ? ""
          : data
            ? `${data.total} engine${data.total === 1 ? "" : "s"}${roster.isFetching ? " · updating…" : ""}`
            : "Loading engines…"}
      </p>
      {roster.isError ? (
        <div className="rl-caution mb-4 !text-base" role="alert">
          <p className="font-semibold">The roster could not be loaded: {(roster.error as Error).message}</p>
          <button type="button" className="rl-button-quiet mt-2" onClick={() => void roster.refetch()}>Try again</button>
        </div>
      ) : null}
      {!data && roster.isPending ? <div className="h-40 animate-pulse border-y-hair border-rule bg-sheet" aria-hidden="true" /> : null}
      {data && data.engines.length === 0 ? <p className="border-y-hair border-rule py-6 text-pencil">No engine matches these filters.</p> : null}
      {data && data.engines.length > 0 ? (
        <div className={roster.isFetching ? "opacity-70 transition-opacity" : ""} aria-busy={roster.isFetching}>
          <RosterTable rows={data.engines} counts={counts.data} units={props.units} unitShort={data.unit} sort={filters.sort} onSort={sortBy} canSeeSignals={props.canSeeSignals} />
          <RosterCards rows={data.engines} counts={counts.data} units={props.units} unitShort={data.unit} canSeeSignals={props.canSeeSignals} />
          {counts.isError ? <p className="mt-2 text-sm text-oxide">Signal counts could not be loaded.</p> : null}
        </div>
      ) : null}
      {data && pages > 1 ? (
        <nav className="mt-4 flex items-center gap-3" aria-label="Roster pages">
          <button type="button" className="rl-button-quiet" disabled={filters.page <= 1} onClick={() => setFilters((f) => ({ ...f, page: f.page - 1 }))}>Previous</button>
          <span className="text-pencil">page {filters.page} of {pages}</span>
          <button type="button" className="rl-button-quiet" disabled={filters.page >= pages} onClick={() => setFilters((f) => ({ ...f, page: f.page + 1 }))}>Next</button>
        </nav>
      ) : null}
    </div>
  );
}

export default function Roster(props: Props): JSX.Element {
  return (
    <QueryRoot>
      <RosterView {...props} />
    </QueryRoot>
  );
}
