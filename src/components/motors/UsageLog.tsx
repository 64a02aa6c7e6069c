import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useState, type SubmitEvent, type JSX } from "react";
import type { UsageEntry, UsageUnit } from "../../lib/motors/types.ts";
import { ApiError, formatDate, formatUsage, getJson, MOTORS_CHANGED_EVENT, requestJson, toQuery, USAGE_UNIT_SHORT } from "./motors-api.ts";
import QueryRoot from "./QueryRoot.tsx";

// "Log a session" in the pits: an engine, a day, how long it ran (or the chassis meter), and
// what the session was. The list below shows what was logged last, so a double entry is seen.

export interface EngineChoice {
  id: number;
  name: string;
  status: string;
  chassis: { number: string; meterKind: string; lastMeterReading: number | null; meterCounts: boolean } | null;
}

interface Props {
  engines: EngineChoice[];
  /** Fixed on an engine file; a choice on the usage page. */
  engineId: number | null;
  /** The choice to start with on the usage page. */
  initialEngineId?: number | null;
  usageUnit: UsageUnit;
  today: string;
  canLog: boolean;
  /** How many recent entries to show; 0 hides the list. */
  recent: number;
}

interface UsageList {
  entries: UsageEntry[];
  total: number;
  totalAmount: number;
  unit: UsageUnit;
}

const SOURCE_LABEL: Record<string, string> = { manual: "logged", meter: "meter read", import: "imported" };

function parseAmount(text: string): number | undefined {
  const t = text.trim().replace(",", ".");
  if (t === "") return undefined;
  return /^\d+(\.\d+)?$/.test(t) ? Number(t) : Number.NaN;
}

function LogForm({ engines, engineId, initialEngineId, usageUnit, today }: Props): JSX.Element {
  const client = useQueryClient();
  const [chosen, setChosen] = useState<string>(String(engineId ?? initialEngineId ?? ""));
  // Where the chassis meter counts, reading it is the usual way; elsewhere the time it ran.
  const [mode, setMode] = useState<"duration" | "meter">("meter");
  const [occurredOn, setOccurredOn] = useState(today);
  const [amount, setAmount] = useState("");
  const [session, setSession] = useState("");
  const [eventLabel, setEventLabel] = useState("");
  const [notes, setNotes] = useState("");
  const [fields, setFields] = useState<Record<string, string>>({});
  const [done, setDone] = useState("");
  const engine = engines.find((e) => String(e.id) === chosen) ?? null;
  const meterOk = Boolean(engine?.chassis?.meterCounts);
  const useMeter = mode === "meter" && meterOk;
  const unit = USAGE_UNIT_SHORT[usageUnit];

  const save = useMutation({
    mutationFn: (body: Record<string, unknown>) => requestJson<{ entry: UsageEntry }>("POST", "/api/v1/usage", body),
    onSuccess: ({ entry }) => {
      setDone(`Logged ${formatUsage(entry.amount, entry.unit)} on ${entry.engineName} for ${formatDate(entry.occurredOn)}.`);
      setAmount("");
      setNotes("");
      setFields({});
      void client.invalidateQueries({ queryKey: ["usage"] });
      window.dispatchEvent(new CustomEvent(MOTORS_CHANGED_EVENT));
    },
    onError: (err) => {
      setDone("");
      setFields(err instanceof ApiError ? err.fields : {});
    },
  });

  function submit(e: SubmitEvent<HTMLFormElement>): void {
    e.preventDefault();
    const value = parseAmount(amount);
    const found: Record<string, string> = {};
    if (!engine) found.engineId = "Choose the engine.";
    if (value === undefined) found.amount = useMeter ? "Enter the meter reading." : "Enter how long it ran.";
    else if (!Number.isFinite(value)) found.amount = "Enter a number, such as 1.5.";
    if (!occurredOn) found.occurredOn = "Enter the day.";
    setFields(found);
    if (Object.keys(found).length || !engine || value === undefined) return;
    save.mutate({
      engineId: engine.id,
      occurredOn,
      ...(useMeter ? { meterReading: value } : { amount: value }),
      sessionLabel: session.trim() || null,
      eventLabel: eventLabel.trim() || null,
      notes: notes.trim() || null,
    });
  }

  const err = (name: string): JSX.Element | null => (fields[name] ? <p id={`log-${name}-error`} className="rl-error" role="alert">{fields[name]}</p> : null);
  const amountError = fields.amount ?? fields.meterReading;
  return (
    <form onSubmit={submit} noValidate className="grid gap-3 sm:grid-cols-2" data-testid="log-session-form" aria-label="Log a session">
      {engineId === null ? (
        <div className="sm:col-span-2">
          <label className="rl-label" htmlFor="log-engine">Engine</label>
          <select id="log-engine" className="rl-field" value={chosen} onChange={(e) => setChosen(e.target.value)} aria-invalid={fields.engineId ? true : undefined}>
            <option value="">Choose…</option>
            {engines.map((e) => (
              <option key={e.id} value={String(e.id)}>{e.name}{e.chassis ? ` · in ${e.chassis.number}` : ""}{e.status !== "running" ? ` · ${e.status === "bench" ? "on the bench" : e.status}` : ""}</option>
            ))}
          </select>
          {err("engineId")}
        </div>
      ) : null}
      {meterOk ? (
        <fieldset className="sm:col-span-2">
          <legend className="rl-label">Count it by</legend>
          <div className="inline-flex overflow-hidden rounded-sm border-hair border-rule">
            {(["duration", "meter"] as const).map((m) => (
              <label key={m} className={`cursor-pointer px-3 py-2 text-sm font-semibold ${mode === m ? "bg-ink text-paper" : "bg-sheet"}`}>
                <input type="radio" className="sr-only" name="log-mode" value={m} checked={mode === m} onChange={() => setMode(m)} />
                {m === "duration" ? "time it ran" : `meter of ${engine?.chassis?.number}`}
              </label>
            ))}
          </div>
        </fieldset>
      ) : null}
      <div>
        <label className="rl-label" htmlFor="log-amount">{useMeter ? `Meter reading now (${unit})` : `Ran for (${unit})`}</label>
        <input id="log-amount" className="rl-field rl-num" inputMode="decimal" autoComplete="off" value={amount} onChange={(e) => setAmount(e.target.value)}
          aria-invalid={amountError ? true : undefined} aria-describedby={amountError ? "log-amount-error" : useMeter ? "log-amount-hint" : undefined} />
        {useMeter && engine?.chassis?.lastMeterReading !== null ? <p id="log-amount-hint" className="mt-1 text-sm text-pencil">Last reading {engine?.chassis?.lastMeterReading} {unit}.</p> : null}
        {amountError ? <p id="log-amount-error" className="rl-error" role="alert">{amountError}</p> : null}
      </div>
      <div>
        <label className="rl-label" htmlFor="log-day">Day</label>
        <input id="log-day" className="rl-field rl-num" type="date" max={today} value={occurredOn} onChange={(e) => setOccurredOn(e.target.value)} aria-invalid={fields.occurredOn ? true : undefined} />
        {err("occurredOn")}
      </div>
      <div>
        <label className="rl-label" htmlFor="log-session">Session</label>
        <input id="log-session" className="rl-field" placeholder="Practice, heat 2, final…" value={session} onChange={(e) => setSession(e.target.value)} maxLength={80} />
        {err("sessionLabel")}
      </div>
      <div>
        <label className="rl-label" htmlFor="log-event">Event or venue</label>
        <input id="log-event" className="rl-field" value={eventLabel} onChange={(e) => setEventLabel(e.target.value)} maxLength={120} />
        {err("eventLabel")}
      </div>
      <div className="sm:col-span-2">
        <label className="rl-label" htmlFor="log-notes">Notes</label>
        <input id="log-notes" className="rl-field" value={notes} onChange={(e) => setNotes(e.target.value)} maxLength={500} />
        {err("notes")}
      </div>
      <div className="sm:col-span-2 flex flex-wrap items-center gap-3">
        <button type="submit" className="rl-button w-full sm:w-auto" disabled={save.isPending} data-testid="log-session-save">
          {save.isPending ? "Logging…" : "Log this session"}
        </button>
        <p role="status" className="text-sm font-semibold text-spruce" data-testid="log-session-done">{done}</p>
      </div>
      {save.isError ? <p className="rl-caution sm:col-span-2 !text-base" role="alert">{(save.error as Error).message}</p> : null}
    </form>
  );
}

function RecentUsage({ engineId, recent }: { engineId: number | null; recent: number }): JSX.Element {
  const list = useQuery({
    queryKey: ["usage", engineId, recent],
    queryFn: () => getJson<UsageList>(`/api/v1/usage${toQuery({ engineId, perPage: recent })}`),
  });
  return (
    <section className="mt-6" aria-labelledby="recent-usage-h">
      <h3 id="recent-usage-h" className="mb-1 font-semibold">Logged lately</h3>
      {list.isPending ? <p className="text-pencil">Loading…</p> : null}
      {list.isError ? (
        <p className="rl-caution" role="alert">The usage list could not be loaded: {(list.error as Error).message} <button type="button" className="underline" onClick={() => void list.refetch()}>Try again</button></p>
      ) : null}
      {list.data ? (
        list.data.entries.length === 0 ? <p className="text-pencil">Nothing logged yet.</p> : (
          <ol className="divide-y divide-rule border-y-hair border-rule text-sm" data-testid="recent-usage">
            {list.data.entries.map((u) => (
              <li key={u.id} className="flex flex-wrap items-baseline gap-x-3 py-1.5">
                <time className="rl-num w-24 shrink-0 text-pencil" dateTime={u.occurredOn}>{formatDate(u.occurredOn)}</time>
                {engineId === null ? <a href={`/motors/${u.engineId}`} className="shrink-0 font-semibold">{u.engineName}</a> : null}
                <span className="rl-num w-14 shrink-0 font-semibold">{formatUsage(u.amount, u.unit)}</span>
                <span className="min-w-0 basis-full sm:basis-0 sm:flex-1">{[u.eventLabel, u.sessionLabel].filter(Boolean).join(" · ") || <span className="text-pencil">no label</span>}</span>
                <span className="basis-full text-xs text-pencil sm:basis-auto">{SOURCE_LABEL[u.source] ?? u.source}{u.loggedBy ? ` by ${u.loggedBy.name}` : ""}</span>
              </li>
            ))}
          </ol>
        )
      ) : null}
    </section>
  );
}

export default function UsageLog(props: Props): JSX.Element {
  return (
    <QueryRoot>
      {props.canLog ? <LogForm {...props} /> : null}
      {props.recent > 0 ? <RecentUsage engineId={props.engineId} recent={props.recent} /> : null}
    </QueryRoot>
  );
}
