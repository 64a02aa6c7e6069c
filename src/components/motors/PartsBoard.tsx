import { keepPreviousData, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useState, type SubmitEvent, type JSX } from "react";
import { formatQuantity, type UnitChoice } from "../../lib/domain/units.ts";
import type { Part, PartKind, UsageUnit } from "../../lib/motors/types.ts";
import { ApiError, getJson, requestJson, toQuery } from "./motors-api.ts";
import QueryRoot from "./QueryRoot.tsx";
import UsageBar from "./UsageBar.tsx";

// Parts with serials and their own lives: where each one is, how much of its life is used, how
// far it has been cut or bored, and moving one to another engine or to the shelf.

interface EngineOption {
  id: number;
  name: string;
  cylinders: number;
}

interface Props {
  engines: EngineOption[];
  initialEngineId: number | null;
  units: UnitChoice;
  usageUnit: UsageUnit;
  today: string;
  canMove: boolean;
}

interface PartList {
  parts: Part[];
  page: number;
  perPage: number;
  total: number;
}

const KINDS: PartKind[] = ["piston", "rings", "crank", "rod", "cylinder", "head", "insert", "other"];
const PER_PAGE = 100;

function MoveForm({ part, engines, today, onDone }: { part: Part; engines: EngineOption[]; today: string; onDone: (text: string) => void }): JSX.Element {
  const client = useQueryClient();
  const [to, setTo] = useState(part.engineId === null ? "" : "shelf");
  const [cylinder, setCylinder] = useState("");
  const [movedOn, setMovedOn] = useState(today);
  const [notes, setNotes] = useState("");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const target = engines.find((e) => String(e.id) === to) ?? null;
  const move = useMutation({
    mutationFn: (body: unknown) => requestJson<{ part: Part }>("POST", `/api/v1/parts/${part.id}/move`, body),
    onSuccess: ({ part: moved }) => {
      void client.invalidateQueries({ queryKey: ["parts"] });
      onDone(`${moved.kind} ${moved.serial} is ${moved.engineName ? `in ${moved.engineName}${moved.cylinderNo ? `, cylinder ${moved.cylinderNo}` : ""}` : "on the shelf"}.`);
    },
    onError: (err) => setErrors(err instanceof ApiError ? err.fields : {}),
  });
  function submit(e: SubmitEvent<HTMLFormElement>): void {
    e.preventDefault();
    if (to === "") {
      setErrors({ toEngineId: "Choose where the part goes." });
      return;
    }
    move.mutate({
      toEngineId: to === "shelf" ? null : Number(to),
      cylinderNo: to !== "shelf" && cylinder ? Number(cylinder) : null,
      movedOn,
      notes: notes.trim() || null,
    });
  }
  return (
    <form onSubmit={submit} noValidate className="mt-2 grid gap-3 border-l-4 border-ink bg-sheet p-3 sm:grid-cols-5 sm:items-end" aria-label={`Move ${part.kind} ${part.serial}`}>
      <div>
        <label className="rl-label" htmlFor={`move-to-${part.id}`}>Move to</label>
        <select id={`move-to-${part.id}`} className="rl-field" value={to} onChange={(e) => { setTo(e.target.value); setCylinder(""); }}>
          <option value="">Choose…</option>
          {part.engineId !== null ? <option value="shelf">the shelf</option> : null}
          {engines.filter((x) => x.id !== part.engineId).map((x) => <option key={x.id} value={String(x.id)}>{x.name}</option>)}
        </select>
        {errors.toEngineId ? <p className="rl-error">{errors.toEngineId}</p> : null}
      </div>
      <div>
        <label className="rl-label" htmlFor={`move-cyl-${part.id}`}>Cylinder</label>
        <select id={`move-cyl-${part.id}`} className="rl-field" value={cylinder} disabled={!target} onChange={(e) => setCylinder(e.target.value)}>
          <option value="">whole engine</option>
          {Array.from({ length: target?.cylinders ?? 0 }, (_, i) => <option key={i} value={String(i + 1)}>{i + 1}</option>)}
        </select>
        {errors.cylinderNo ? <p className="rl-error">{errors.cylinderNo}</p> : null}
      </div>
      <div>
        <label className="rl-label" htmlFor={`move-on-${part.id}`}>On</label>
        <input id={`move-on-${part.id}`} type="date" max={today} className="rl-field" value={movedOn} onChange={(e) => setMovedOn(e.target.value)} />
        {errors.movedOn ? <p className="rl-error">{errors.movedOn}</p> : null}
      </div>
      <div>
        <label className="rl-label" htmlFor={`move-notes-${part.id}`}>Notes</label>
        <input id={`move-notes-${part.id}`} className="rl-field" value={notes} maxLength={500} onChange={(e) => setNotes(e.target.value)} />
      </div>
      <button type="submit" className="rl-button" disabled={move.isPending}>Move</button>
      {move.isError ? <p className="rl-error sm:col-span-5" role="alert">{(move.error as Error).message}</p> : null}
    </form>
  );
}

function Board({ engines, initialEngineId, units, usageUnit, today, canMove }: Props): JSX.Element {
  const [engineId, setEngineId] = useState(initialEngineId === null ? "" : String(initialEngineId));
  const [kind, setKind] = useState("");
  const [search, setSearch] = useState("");
  const [page, setPage] = useState(1);
  const [moving, setMoving] = useState<number | null>(null);
  const [notice, setNotice] = useState("");
  const shelf = engineId === "shelf";
  const path = `/api/v1/parts${toQuery({ engineId: shelf ? "" : engineId, onShelf: shelf ? "true" : "", kind, search: search.trim(), page: page > 1 ? page : "", perPage: PER_PAGE })}`;
  const list = useQuery({ queryKey: ["parts", path], queryFn: () => getJson<PartList>(path), placeholderData: keepPreviousData });
  const pages = list.data ? Math.max(1, Math.ceil(list.data.total / list.data.perPage)) : 1;
  const machining = (p: Part): string =>
    [
      p.totalCutMm > 0 ? `cut ${formatQuantity("length", p.totalCutMm, units)}${p.maxTotalCutMm !== null ? ` of ${formatQuantity("length", p.maxTotalCutMm, units)}` : ""}` : "",
      p.oversizeMm > 0 ? `+${formatQuantity("length", p.oversizeMm, units)} oversize` : "",
    ].filter(Boolean).join(", ");

  return (
    <div data-testid="parts-board">
      <form role="search" className="mb-4 grid gap-3 sm:grid-cols-3" onSubmit={(e) => e.preventDefault()}>
        <div>
          <label className="rl-label" htmlFor="parts-engine">Where</label>
          <select id="parts-engine" className="rl-field" value={engineId} onChange={(e) => { setEngineId(e.target.value); setPage(1); }}>
            <option value="">everywhere</option>
            <option value="shelf">on the shelf</option>
            {engines.map((e) => <option key={e.id} value={String(e.id)}>{e.name}</option>)}
          </select>
        </div>
        <div>
          <label className="rl-label" htmlFor="parts-kind">Kind</label>
          <select id="parts-kind" className="rl-field" value={kind} onChange={(e) => { setKind(e.target.value); setPage(1); }}>
            <option value="">every kind</option>
            {KINDS.map((k) => <option key={k}>{k}</option>)}
          </select>
        </div>
        <div>
          <label className="rl-label" htmlFor="parts-search">Serial</label>
          <input id="parts-search" type="search" className="rl-field" value={search} onChange={(e) => { setSearch(e.target.value); setPage(1); }} />
        </div>
      </form>
      <p role="status" className="mb-2 font-semibold text-spruce" data-testid="parts-notice">{notice}</p>
      {list.isPending ? <p className="text-pencil">Loading parts…</p> : null}
      {list.isError ? (
        <p className="rl-caution" role="alert">The parts could not be loaded: {(list.error as Error).message} <button type="button" className="underline" onClick={() => void list.refetch()}>Try again</button></p>
      ) : null}
      {list.data ? (
        list.data.parts.length === 0 ? <p className="border-y-hair border-rule py-4 text-pencil">No part matches.</p> : (
          <ul className={`divide-y divide-rule border-y-hair border-rule ${list.isFetching ? "opacity-70" : ""}`}>
            {list.data.parts.map((p) => (
              <li key={p.id} className="py-3" data-testid="part-row" data-serial={p.serial}>
                <div className="grid gap-2 sm:grid-cols-[1fr_12rem_11rem_auto] sm:items-center">
                  <div>
                    <p><span className="font-semibold">{p.kind}</span> {p.serial}</p>
                    <p className="text-sm text-pencil">{p.description}</p>
                  </div>
                  <p className="text-sm" data-testid="part-where">
                    {p.engineId ? <>in <a href={`/motors/${p.engineId}`} className="font-semibold">{p.engineName}</a>{p.cylinderNo ? `, cylinder ${p.cylinderNo}` : ""}</> : <span className="text-pencil">on the shelf</span>}
                    {machining(p) ? <span className="rl-num block text-pencil">{machining(p)}</span> : null}
                  </p>
                  <UsageBar compact label={`Life of ${p.serial}`} counter={p.counters.life} unit={usageUnit} />
                  {canMove && !p.archivedAt ? (
                    <button type="button" className="rl-button-quiet !min-h-0 !py-1.5" aria-expanded={moving === p.id} onClick={() => setMoving(moving === p.id ? null : p.id)}>Move</button>
                  ) : <span />}
                </div>
                {moving === p.id ? <MoveForm part={p} engines={engines} today={today} onDone={(t) => { setMoving(null); setNotice(t); }} /> : null}
              </li>
            ))}
          </ul>
        )
      ) : null}
      {list.data && pages > 1 ? (
        <nav className="mt-4 flex items-center gap-3" aria-label="Parts pages">
          <button type="button" className="rl-button-quiet" disabled={page <= 1} onClick={() => setPage(page - 1)}>Previous</button>
          <span className="text-pencil">page {page} of {pages}</span>
          <button type="button" className="rl-button-quiet" disabled={page >= pages} onClick={() => setPage(page + 1)}>Next</button>
        </nav>
      ) : null}
    </div>
  );
}

export default function PartsBoard(props: Props): JSX.Element {
  return (
    <QueryRoot>
      <Board {...props} />
    </QueryRoot>
  );
}
