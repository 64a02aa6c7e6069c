import { useEffect, useState, type JSX } from "react";
import type { EventDetail, FuelCheckView, PlanEngine, SeasonEntry } from "../../lib/season/types.ts";
import { callApi, formatRange, formatUsage } from "./api.ts";
import ItemMark from "./ItemMark.tsx";

// One event as the crew opens it: each chassis with its engine and the life left after the
// event, why the planner chose it, the fuel check for that elevation and air temperature with
// its cautions, and the fuel the crew chief recorded.

const KPA_PER_PSI = 6.894757293168361; // 1 lbf/in² in kPa (NIST SP 811, B.8)
const M_PER_FT = 0.3048; // exact, by the 1959 international yard and pound agreement

interface Props {
  eventId: number;
  today: string;
  engines: PlanEngine[];
  canPlan: boolean;
  canDecideFuel: boolean;
  /** Bumped by the parent after any plan change, so the panel reloads. */
  version: number;
  onPlanChanged: (message: string) => void;
  onClose: () => void;
}

function FuelCheck({ fc }: { fc: FuelCheckView }): JSX.Element {
  if (!fc.check) return <p className="text-sm text-pencil">{fc.note}</p>;
  const c = fc.check;
  return (
    <div className="text-sm">
      <dl className="grid grid-cols-2 gap-x-4 gap-y-1 sm:grid-cols-4">
        <div><dt className="text-pencil">Chamber (accepted {c.chamberTakenOn})</dt><dd className="rl-num font-semibold">{c.chamberCc.toFixed(1)} cc</dd></div>
        <div><dt className="text-pencil">{c.ratioBasis === "trapped" ? "Trapped ratio" : "Geometric ratio"}</dt><dd className="rl-num font-semibold">{(c.trappedRatio ?? c.geometricRatio).toFixed(2)} : 1</dd></div>
        <div><dt className="text-pencil">Density altitude</dt><dd className="rl-num font-semibold">{Math.round(c.densityAltitudeM).toLocaleString("en-US")} m ({Math.round(c.densityAltitudeM / M_PER_FT).toLocaleString("en-US")} ft)</dd></div>
        <div><dt className="text-pencil">Estimated cranking</dt><dd className="rl-num font-semibold">{Math.round(c.crankingKpaEstimate)} kPa ({Math.round(c.crankingKpaEstimate / KPA_PER_PSI)} psi)</dd></div>
      </dl>
      <p className="mt-2"><span className="text-pencil">Team's fuel table row:</span> <strong>{c.fuelGrade ?? "no row applies"}</strong>{c.fuelGrade ? <span className="rl-num text-pencil"> (margin {Math.round(c.marginKpa)} kPa)</span> : null}</p>
      {c.riskFlags.length ? (
        <ul className="mt-2 space-y-1">
          {c.riskFlags.map((f) => (
            <li key={f.code} className="flex gap-2"><ItemMark kind="act" /><span>{f.message}</span></li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

function FuelRecord({ entry, eventId, canDecideFuel, onSaved }: { entry: SeasonEntry; eventId: number; canDecideFuel: boolean; onSaved: () => void }): JSX.Element {
  const [text, setText] = useState(entry.fuelRun ?? "");
  const [error, setError] = useState("");
  const [busy, setBusy] = useState(false);
  const recorded = entry.fuelRun ? (
    <p className="text-sm">Fuel run: <strong>{entry.fuelRun}</strong>{entry.fuelDecidedBy ? <span className="text-pencil"> — recorded by {entry.fuelDecidedBy.name}</span> : null}</p>
  ) : (
    <p className="text-sm text-pencil">No fuel recorded yet.</p>
  );
  if (!canDecideFuel) return recorded;
  async function save(): Promise<void> {
    setBusy(true);
    const answer = await callApi("POST", `/api/v1/events/${eventId}/entries/${entry.id}`, { fuelRun: text });
    setBusy(false);
    if (!answer.ok) return setError(answer.fields?.fuelRun ?? answer.message);
    setError("");
    onSaved();
  }
  return (
    <div className="mt-2">
      {recorded}
      <label className="rl-label mt-2" htmlFor={`fuel-${entry.id}`}>Fuel run for {entry.chassisNumber}</label>
      <div className="flex gap-2">
        <input id={`fuel-${entry.id}`} className="rl-field" value={text} maxLength={200} onChange={(e) => setText(e.target.value)} placeholder="As mixed: grade, ratio, can number" />
        <button type="button" className="rl-button-quiet shrink-0" disabled={busy || text.trim() === ""} onClick={() => void save()}>Record</button>
      </div>
      {error ? <p className="rl-error" role="alert">{error}</p> : null}
    </div>
  );
}

function PinControl({ entry, eventId, engines, onChanged }: { entry: SeasonEntry; eventId: number; engines: PlanEngine[]; onChanged: (message: string) => void }): JSX.Element {
  const [choice, setChoice] = useState(entry.engineId === null ? "" : String(entry.engineId));
  const [error, setError] = useState("");
  const [busy, setBusy] = useState(false);
  async function pin(engineId: number | null): Promise<void> {
    setBusy(true);
    const answer = await callApi<{ pinned: boolean }>("PATCH", `/api/v1/events/${eventId}/entries/${entry.id}`, { engineId });
    setBusy(false);
    if (!answer.ok) return setError(answer.message);
    setError("");
    onChanged(engineId === null ? `The pin on ${entry.chassisNumber} is lifted; re-plan to let the planner choose again.` : `Pinned; the season was re-planned around it.`);
  }
  return (
    <div className="mt-2">
      <label className="rl-label" htmlFor={`pin-${entry.id}`}>Pin an engine to {entry.chassisNumber}</label>
      <div className="flex flex-wrap gap-2">
        <select id={`pin-${entry.id}`} className="rl-field !w-auto" value={choice} onChange={(e) => setChoice(e.target.value)}>
          <option value="">Choose…</option>
          {engines.map((e) => (
            <option key={e.id} value={e.id}>{e.name}{e.chassisNumber ? ` (in ${e.chassisNumber})` : ""}</option>
          ))}
        </select>
        <button type="button" className="rl-button-quiet" disabled={busy || choice === ""} onClick={() => void pin(Number(choice))}>Pin</button>
        {entry.pinned ? <button type="button" className="rl-button-quiet" disabled={busy} onClick={() => void pin(null)}>Lift the pin</button> : null}
      </div>
      {error ? <p className="rl-error" role="alert">{error}</p> : null}
    </div>
  );
}

export default function EventPanel({ eventId, today, engines, canPlan, canDecideFuel, version, onPlanChanged, onClose }: Props): JSX.Element {
  const [detail, setDetail] = useState<EventDetail | null>(null);
  const [error, setError] = useState("");
  const [reload, setReload] = useState(0);
  useEffect(() => {
    let live = true;
    void callApi<EventDetail>("GET", `/api/v1/events/${eventId}`).then((a) => {
      if (!live) return;
      if (a.ok) setDetail(a.body);
      else setError(a.message);
    });
    return () => {
      live = false;
    };
  }, [eventId, version, reload]);
  if (error) return <p className="rl-caution" role="alert">{error}</p>;
  if (!detail) return <p className="text-pencil" role="status">Loading the event…</p>;
  const ev = detail.event;
  const unit = detail.usageUnit;
  return (
    <section aria-labelledby="event-title" data-testid="event-panel">
      <div className="flex items-start justify-between gap-3">
        <div>
          <p className="rl-eyebrow">{ev.kind}{ev.important ? " · important" : ""}</p>
          <h2 id="event-title" className="flex items-center gap-2"><ItemMark kind={ev.important ? "important" : "event"} />{ev.name}</h2>
          <p className="rl-num text-pencil">
            {formatRange(ev.startsOn, ev.endsOn)} · {ev.venue ? `${ev.venue} · ` : ""}{ev.elevationM.toLocaleString("en-US")} m ({Math.round(ev.elevationM / M_PER_FT).toLocaleString("en-US")} ft)
            {ev.expectedAirTempC !== null ? ` · expected ${String(ev.expectedAirTempC).replace("-", "\u2212")}\u00a0°C` : ""}
          </p>
        </div>
        <button type="button" className="rl-button-quiet !min-h-0 !py-1.5" onClick={onClose}>Close</button>
      </div>
      {ev.entries.length === 0 ? <p className="mt-3 text-pencil">No chassis entered yet.</p> : null}
      <ul className="mt-3 divide-y divide-rule border-y-hair border-rule">
        {ev.entries.map((x) => {
          const fc = detail.fuelChecks.find((f) => f.engineId === x.engineId);
          return (
            <li key={x.id} className="py-3" data-testid="event-entry">
              <div className="flex flex-wrap items-baseline gap-x-4 gap-y-1">
                <span className="text-lg font-semibold">{x.chassisNumber}</span>
                <span className="font-semibold">{x.engineName ?? "no engine yet"}{x.pinned ? <span className="ml-1 text-sm font-normal text-pencil">(pinned)</span> : null}</span>
                <span className="rl-num text-pencil">{formatUsage(x.expectedUsage, unit)} expected</span>
                {x.usageLeftAfter !== null ? <span className="rl-num">{formatUsage(x.usageLeftAfter, unit)} left after</span> : null}
              </div>
              {detail.explanations[String(x.id)] ? <p className="mt-1 text-sm text-pencil">{detail.explanations[String(x.id)]}</p> : null}
              {fc ? <div className="mt-2 border-l-hair border-rule pl-3"><p className="rl-eyebrow mb-1">Fuel check at {ev.elevationM.toLocaleString("en-US")} m</p><FuelCheck fc={fc} /></div> : null}
              <FuelRecord entry={x} eventId={ev.id} canDecideFuel={canDecideFuel} onSaved={() => setReload((n) => n + 1)} />
              {canPlan && ev.startsOn >= today ? <PinControl entry={x} eventId={ev.id} engines={engines} onChanged={onPlanChanged} /> : null}
            </li>
          );
        })}
      </ul>
      {detail.fuelChecks.length ? (
        <div className="rl-caution mt-3" data-testid="fuel-cautions">
          <p className="font-semibold">Before you act on a fuel check</p>
          <ul className="mt-1 list-disc pl-5">
            {detail.cautions.map((c) => <li key={c}>{c}</li>)}
          </ul>
        </div>
      ) : null}
    </section>
  );
}
