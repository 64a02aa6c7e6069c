import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useState, type SubmitEvent, type JSX } from "react";
import type { Chassis, Installation, Roster } from "../../lib/motors/types.ts";
import { ApiError, formatDate, getJson, MOTORS_CHANGED_EVENT, requestJson } from "./motors-api.ts";
import QueryRoot from "./QueryRoot.tsx";

// The chassis: which engine sits in each, since when and at what meter reading; installing
// and removing engines with the meter read at each end, so a metered chassis counts the hours.

interface Props {
  initialChassis: Chassis[];
  canEdit: boolean;
}

const KINDS = ["sled", "bike", "kart", "atv", "utv", "car", "other"] as const;
const METER_LABEL: Record<string, string> = { hours: "hour meter", km: "odometer (km)", none: "no meter" };
const METER_UNIT: Record<string, string> = { hours: "h", km: "km", none: "" };

/** A datetime-local value ("2026-12-01T14:30") in the browser's zone, as an instant for the API. */
function toInstant(local: string): string | undefined {
  if (!local) return undefined;
  const d = new Date(local);
  return Number.isNaN(d.getTime()) ? undefined : d.toISOString();
}

function nowLocal(): string {
  const d = new Date();
  d.setSeconds(0, 0);
  return new Date(d.getTime() - d.getTimezoneOffset() * 60_000).toISOString().slice(0, 16);
}

function readMeter(text: string): number | null | "bad" {
  const t = text.trim().replace(",", ".");
  if (t === "") return null;
  return /^\d+(\.\d+)?$/.test(t) ? Number(t) : "bad";
}

function InstallForm({ chassis, onDone }: { chassis: Chassis; onDone: (text: string) => void }): JSX.Element {
  const client = useQueryClient();
  const spare = useQuery({
    queryKey: ["uninstalled-engines"],
    queryFn: () => getJson<Roster>("/api/v1/engines?chassisId=none&status=running,bench,spare&perPage=200"),
  });
  const [engineId, setEngineId] = useState("");
  const [at, setAt] = useState(nowLocal);
  const [meter, setMeter] = useState(chassis.lastMeterReading !== null ? String(chassis.lastMeterReading) : "");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const install = useMutation({
    mutationFn: (body: unknown) => requestJson<{ installation: Installation }>("POST", `/api/v1/chassis/${chassis.id}/install`, body),
    onSuccess: ({ installation }) => {
      void client.invalidateQueries();
      window.dispatchEvent(new CustomEvent(MOTORS_CHANGED_EVENT));
      onDone(`${installation.engineName} is in chassis ${installation.chassisNumber}.`);
    },
    onError: (err) => setErrors(err instanceof ApiError ? err.fields : {}),
  });
  function submit(e: SubmitEvent<HTMLFormElement>): void {
    e.preventDefault();
    const m = readMeter(meter);
    const found: Record<string, string> = {};
    if (!engineId) found.engineId = "Choose the engine.";
    if (m === "bad") found.meterAtInstall = "Enter the meter reading as a number.";
    setErrors(found);
    if (Object.keys(found).length) return;
    install.mutate({ engineId: Number(engineId), installedAt: toInstant(at), ...(chassis.meterKind !== "none" ? { meterAtInstall: m === "bad" ? null : m } : {}) });
  }
  return (
    <form onSubmit={submit} noValidate className="mt-3 grid gap-3 border-l-4 border-ink bg-sheet p-3 sm:grid-cols-4 sm:items-end" aria-label={`Install an engine in chassis ${chassis.number}`}>
      <div>
        <label className="rl-label" htmlFor={`inst-engine-${chassis.id}`}>Engine</label>
        <select id={`inst-engine-${chassis.id}`} className="rl-field" value={engineId} onChange={(e) => setEngineId(e.target.value)}>
          <option value="">{spare.isPending ? "Loading…" : "Choose…"}</option>
          {(spare.data?.engines ?? []).map((x) => <option key={x.id} value={String(x.id)}>{x.name}</option>)}
        </select>
        {errors.engineId ? <p className="rl-error">{errors.engineId}</p> : null}
        {spare.isError ? <p className="rl-error">The engines could not be loaded.</p> : null}
      </div>
      <div>
        <label className="rl-label" htmlFor={`inst-at-${chassis.id}`}>Installed at</label>
        <input id={`inst-at-${chassis.id}`} type="datetime-local" className="rl-field" value={at} onChange={(e) => setAt(e.target.value)} />
        {errors.installedAt ? <p className="rl-error">{errors.installedAt}</p> : null}
      </div>
      {chassis.meterKind !== "none" ? (
        <div>
          <label className="rl-label" htmlFor={`inst-meter-${chassis.id}`}>Meter now ({METER_UNIT[chassis.meterKind]})</label>
          <input id={`inst-meter-${chassis.id}`} className="rl-field rl-num" inputMode="decimal" value={meter} onChange={(e) => setMeter(e.target.value)} />
          {errors.meterAtInstall ? <p className="rl-error">{errors.meterAtInstall}</p> : null}
        </div>
      ) : null}
      <button type="submit" className="rl-button" disabled={install.isPending}>Install</button>
      {install.isError ? <p className="rl-error sm:col-span-4" role="alert">{(install.error as Error).message}</p> : null}
    </form>
  );
}

function RemoveForm({ chassis, onDone }: { chassis: Chassis; onDone: (text: string) => void }): JSX.Element {
  const client = useQueryClient();
  const [at, setAt] = useState(nowLocal);
  const [meter, setMeter] = useState("");
  const [status, setStatus] = useState<"bench" | "spare" | "retired">("bench");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const remove = useMutation({
    mutationFn: (body: unknown) => requestJson<{ installation: Installation }>("POST", `/api/v1/chassis/${chassis.id}/remove`, body),
    onSuccess: ({ installation }) => {
      void client.invalidateQueries();
      window.dispatchEvent(new CustomEvent(MOTORS_CHANGED_EVENT));
      onDone(`${installation.engineName} is out of chassis ${installation.chassisNumber}.`);
    },
    onError: (err) => setErrors(err instanceof ApiError ? err.fields : {}),
  });
  function submit(e: SubmitEvent<HTMLFormElement>): void {
    e.preventDefault();
    const m = readMeter(meter);
    if (m === "bad") {
      setErrors({ meterAtRemoval: "Enter the meter reading as a number." });
      return;
    }
    remove.mutate({ removedAt: toInstant(at), status, ...(chassis.meterKind !== "none" ? { meterAtRemoval: m } : {}) });
  }
  return (
    <form onSubmit={submit} noValidate className="mt-3 grid gap-3 border-l-4 border-ink bg-sheet p-3 sm:grid-cols-4 sm:items-end" aria-label={`Remove the engine from chassis ${chassis.number}`}>
      <div>
        <label className="rl-label" htmlFor={`rem-at-${chassis.id}`}>Removed at</label>
        <input id={`rem-at-${chassis.id}`} type="datetime-local" className="rl-field" value={at} onChange={(e) => setAt(e.target.value)} />
        {errors.removedAt ? <p className="rl-error">{errors.removedAt}</p> : null}
      </div>
      {chassis.meterKind !== "none" ? (
        <div>
          <label className="rl-label" htmlFor={`rem-meter-${chassis.id}`}>Meter now ({METER_UNIT[chassis.meterKind]})</label>
          <input id={`rem-meter-${chassis.id}`} className="rl-field rl-num" inputMode="decimal" value={meter} placeholder={chassis.lastMeterReading !== null ? `last ${chassis.lastMeterReading}` : ""} onChange={(e) => setMeter(e.target.value)} />
          {errors.meterAtRemoval ? <p className="rl-error">{errors.meterAtRemoval}</p> : null}
        </div>
      ) : null}
      <div>
        <label className="rl-label" htmlFor={`rem-status-${chassis.id}`}>The engine goes</label>
        <select id={`rem-status-${chassis.id}`} className="rl-field" value={status} onChange={(e) => setStatus(e.target.value as typeof status)}>
          <option value="bench">on the bench</option>
          <option value="spare">to the spares</option>
          <option value="retired">into retirement</option>
        </select>
      </div>
      <button type="submit" className="rl-button" disabled={remove.isPending}>Remove</button>
      {remove.isError ? <p className="rl-error sm:col-span-4" role="alert">{(remove.error as Error).message}</p> : null}
    </form>
  );
}

function ChassisHistory({ chassisId }: { chassisId: number }): JSX.Element {
  const q = useQuery({ queryKey: ["chassis", chassisId], queryFn: () => getJson<{ installations: Installation[] }>(`/api/v1/chassis/${chassisId}`) });
  if (q.isPending) return <p className="text-sm text-pencil">Loading…</p>;
  if (q.isError) return <p className="rl-error">The history could not be loaded.</p>;
  if (!q.data.installations.length) return <p className="text-sm text-pencil">No engine has been in this chassis yet.</p>;
  return (
    <ol className="text-sm">
      {q.data.installations.map((i) => (
        <li key={i.id} className="rl-num">
          <a href={`/motors/${i.engineId}`}>{i.engineName}</a> {formatDate(i.installedAt.slice(0, 10))}{i.meterAtInstall !== null ? ` (${i.meterAtInstall})` : ""} → {i.removedAt ? `${formatDate(i.removedAt.slice(0, 10))}${i.meterAtRemoval !== null ? ` (${i.meterAtRemoval})` : ""}` : "still in"}
        </li>
      ))}
    </ol>
  );
}

function NewChassis(): JSX.Element {
  const client = useQueryClient();
  const [number, setNumber] = useState("");
  const [kind, setKind] = useState<(typeof KINDS)[number]>("sled");
  const [meterKind, setMeterKind] = useState("hours");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const create = useMutation({
    mutationFn: () => requestJson("POST", "/api/v1/chassis", { number: number.trim(), kind, meterKind }),
    onSuccess: () => {
      setNumber("");
      setErrors({});
      void client.invalidateQueries({ queryKey: ["chassis-list"] });
    },
    onError: (err) => setErrors(err instanceof ApiError ? err.fields : {}),
  });
  return (
    <form onSubmit={(e) => { e.preventDefault(); create.mutate(); }} noValidate className="grid gap-3 sm:grid-cols-4 sm:items-end" aria-label="Add a chassis">
      <div>
        <label className="rl-label" htmlFor="new-chassis-number">Number</label>
        <input id="new-chassis-number" className="rl-field" value={number} maxLength={20} onChange={(e) => setNumber(e.target.value)} />
        {errors.number ? <p className="rl-error">{errors.number}</p> : null}
      </div>
      <div>
        <label className="rl-label" htmlFor="new-chassis-kind">Kind</label>
        <select id="new-chassis-kind" className="rl-field" value={kind} onChange={(e) => setKind(e.target.value as typeof kind)}>{KINDS.map((k) => <option key={k}>{k}</option>)}</select>
      </div>
      <div>
        <label className="rl-label" htmlFor="new-chassis-meter">Meter</label>
        <select id="new-chassis-meter" className="rl-field" value={meterKind} onChange={(e) => setMeterKind(e.target.value)}>
          {Object.entries(METER_LABEL).map(([k, l]) => <option key={k} value={k}>{l}</option>)}
        </select>
      </div>
      <button type="submit" className="rl-button-quiet" disabled={create.isPending}>Add chassis</button>
      {create.isError ? <p className="rl-error sm:col-span-4" role="alert">{(create.error as Error).message}</p> : null}
    </form>
  );
}

function Board({ initialChassis, canEdit }: Props): JSX.Element {
  const list = useQuery({ queryKey: ["chassis-list"], queryFn: async () => (await getJson<{ chassis: Chassis[] }>("/api/v1/chassis")).chassis, initialData: initialChassis });
  const [open, setOpen] = useState<{ id: number; action: "install" | "remove" | "history" } | null>(null);
  const [notice, setNotice] = useState("");
  const done = (text: string): void => {
    setOpen(null);
    setNotice(text);
  };
  const toggle = (id: number, action: "install" | "remove" | "history"): void => setOpen(open?.id === id && open.action === action ? null : { id, action });
  return (
    <div data-testid="chassis-board">
      <p role="status" className="mb-3 font-semibold text-spruce">{notice}</p>
      {list.isError ? <p className="rl-caution mb-3" role="alert">The chassis could not be loaded: {(list.error as Error).message}</p> : null}
      <ul className="divide-y divide-rule border-y-hair border-rule">
        {(list.data ?? []).map((c) => (
          <li key={c.id} className="py-3" data-testid="chassis-row" data-chassis={c.number}>
            <div className="flex flex-wrap items-baseline gap-x-4 gap-y-1">
              <span className="text-lg font-semibold">{c.kind} {c.number}</span>
              <span className="text-sm text-pencil">{METER_LABEL[c.meterKind]}{c.lastMeterReading !== null ? `, last ${c.lastMeterReading} ${METER_UNIT[c.meterKind]}` : ""}</span>
              <span className="min-w-0 flex-1">
                {c.current ? (
                  <>Engine <a href={`/motors/${c.current.engineId}`} className="font-semibold">{c.current.engineName}</a> since {formatDate(c.current.installedAt.slice(0, 10))}{c.current.meterAtInstall !== null ? ` at ${c.current.meterAtInstall} ${METER_UNIT[c.meterKind]}` : ""}</>
                ) : <span className="text-pencil">empty</span>}
              </span>
              <span className="flex flex-wrap gap-2">
                {canEdit && !c.archivedAt ? (
                  c.current ? (
                    <button type="button" className="rl-button-quiet !min-h-0 !py-1.5" aria-expanded={open?.id === c.id && open.action === "remove"} onClick={() => toggle(c.id, "remove")}>Remove engine</button>
                  ) : (
                    <button type="button" className="rl-button-quiet !min-h-0 !py-1.5" aria-expanded={open?.id === c.id && open.action === "install"} onClick={() => toggle(c.id, "install")}>Install an engine</button>
                  )
                ) : null}
                <button type="button" className="rl-button-quiet !min-h-0 !py-1.5" aria-expanded={open?.id === c.id && open.action === "history"} onClick={() => toggle(c.id, "history")}>History</button>
              </span>
            </div>
            {c.notes ? <p className="text-sm text-pencil">{c.notes}</p> : null}
            {open?.id === c.id && open.action === "install" ? <InstallForm chassis={c} onDone={done} /> : null}
            {open?.id === c.id && open.action === "remove" ? <RemoveForm chassis={c} onDone={done} /> : null}
            {open?.id === c.id && open.action === "history" ? <div className="mt-2"><ChassisHistory chassisId={c.id} /></div> : null}
          </li>
        ))}
      </ul>
      {canEdit ? (
        <section className="mt-8" aria-labelledby="new-chassis-h">
          <h2 id="new-chassis-h" className="mb-2">Add a chassis</h2>
          <NewChassis />
        </section>
      ) : null}
    </div>
  );
}

export default function ChassisBoard(props: Props): JSX.Element {
  return (
    <QueryRoot>
      <Board {...props} />
    </QueryRoot>
  );
}
