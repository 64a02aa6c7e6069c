import { useState, type SubmitEvent, type JSX } from "react";
import type { SignalThresholds } from "../../lib/domain/signal-rules/types.ts";
import { ApiError, requestJson } from "./motors-api.ts";

// A crew chief's own signal thresholds for one engine (a fresh build that reads noisier, a
// motor being run to its limit on purpose). Empty fields follow the organisation.

type Overrides = Record<string, Record<string, number>>;

interface View {
  engineId: number;
  effective: SignalThresholds;
  organisation: SignalThresholds;
  overrides: Overrides | null;
}

interface Props {
  initial: View;
  canEdit: boolean;
}

/** Group, field, words and unit; the order a crew chief reads them in. */
const ROWS: [string, string, string, string][] = [
  ["chamber", "watchDropPct", "Chamber volume drop: watch", "%"],
  ["chamber", "actDropPct", "Chamber volume drop: act", "%"],
  ["chamberSpread", "watchPct", "Chamber spread between cylinders: watch", "%"],
  ["chamberSpread", "actPct", "Chamber spread between cylinders: act", "%"],
  ["chamberSpread", "actCc", "Chamber spread between cylinders: act", "cc"],
  ["squish", "watchMm", "Squish change: watch", "mm"],
  ["squish", "actDownMm", "Squish smaller: act", "mm"],
  ["squish", "actUpMm", "Squish larger: act", "mm"],
  ["squishSides", "watchMm", "Squish side to side: watch", "mm"],
  ["squishSides", "actMm", "Squish side to side: act", "mm"],
  ["squishSpread", "watchMm", "Squish between cylinders: watch", "mm"],
  ["squishSpread", "actMm", "Squish between cylinders: act", "mm"],
  ["cranking", "watchDropPct", "Cranking drop: watch", "%"],
  ["cranking", "actDropPct", "Cranking drop: act", "%"],
  ["cranking", "watchRisePct", "Cranking rise: watch", "%"],
  ["cranking", "actRisePct", "Cranking rise: act", "%"],
  ["crankingSpread", "watchPct", "Cranking between cylinders: watch", "%"],
  ["crankingSpread", "actPct", "Cranking between cylinders: act", "%"],
  ["leakdown", "watchPct", "Leak-down: watch above", "%"],
  ["leakdown", "actPct", "Leak-down: act above", "%"],
  ["leakdown", "watchPoints", "Leak-down rise: watch", "points"],
  ["leakdown", "actPoints", "Leak-down rise: act", "points"],
];

const keyOf = (group: string, field: string): string => `${group}.${field}`;

function valueOf(t: SignalThresholds, group: string, field: string): number {
  return (t as unknown as Record<string, Record<string, number>>)[group][field];
}

function toTexts(overrides: Overrides | null): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [group, fields] of Object.entries(overrides ?? {})) for (const [f, v] of Object.entries(fields)) out[keyOf(group, f)] = String(v);
  return out;
}

export default function ThresholdsForm({ initial, canEdit }: Props): JSX.Element {
  const [view, setView] = useState<View>(initial);
  const [texts, setTexts] = useState<Record<string, string>>(() => toTexts(initial.overrides));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [status, setStatus] = useState("");
  const [busy, setBusy] = useState(false);

  async function send(thresholds: Overrides | null): Promise<void> {
    setBusy(true);
    setStatus("Saving…");
    try {
      const next = await requestJson<View>("PATCH", `/api/v1/engines/${view.engineId}/thresholds`, { thresholds });
      setView(next);
      setTexts(toTexts(next.overrides));
      setErrors({});
      setStatus(next.overrides ? "Saved: the next signal check uses this engine's own thresholds." : "Saved: this engine follows the organisation's thresholds.");
    } catch (err) {
      const fields = err instanceof ApiError ? err.fields : {};
      const mapped: Record<string, string> = {};
      for (const [k, v] of Object.entries(fields)) mapped[k.replace(/^thresholds\./, "")] = v;
      setErrors(mapped);
      setStatus(`Not saved: ${(err as Error).message}`);
    } finally {
      setBusy(false);
    }
  }

  function submit(e: SubmitEvent<HTMLFormElement>): void {
    e.preventDefault();
    const out: Overrides = {};
    const found: Record<string, string> = {};
    for (const [group, field] of ROWS) {
      const text = (texts[keyOf(group, field)] ?? "").trim().replace(",", ".");
      if (text === "") continue;
      const n = Number(text);
      if (!/^\d*\.?\d+$/.test(text) || !(n > 0)) found[keyOf(group, field)] = "Enter a number greater than zero, or leave it empty.";
      else (out[group] ??= {})[field] = n;
    }
    setErrors(found);
    if (Object.keys(found).length) return;
    void send(Object.keys(out).length ? out : null);
  }

  return (
    <form onSubmit={submit} noValidate data-testid="thresholds-form">
      <table className="w-full border-collapse text-sm">
        <thead>
          <tr className="border-b-hair border-ink text-left text-pencil">
            <th scope="col" className="py-1.5 pr-2 font-semibold">Threshold</th>
            <th scope="col" className="px-2 py-1.5 text-right font-semibold">Organisation</th>
            <th scope="col" className="px-2 py-1.5 text-right font-semibold">{canEdit ? "This engine" : "In use"}</th>
          </tr>
        </thead>
        <tbody>
          {ROWS.map(([group, field, label, unit]) => {
            const k = keyOf(group, field);
            const own = view.overrides?.[group]?.[field];
            return (
              <tr key={k} className="border-b-hair border-rule">
                <th scope="row" className="py-1.5 pr-2 text-left font-normal">
                  <label htmlFor={`thr-${k}`}>{label}</label>
                  {errors[k] ? <p className="rl-error" role="alert">{errors[k]}</p> : null}
                </th>
                <td className="rl-num px-2 text-right text-pencil">{valueOf(view.organisation, group, field)} {unit}</td>
                <td className="px-2 py-1 text-right">
                  {canEdit ? (
                    <span className="inline-flex items-center gap-1">
                      <input
                        id={`thr-${k}`}
                        className={`rl-field rl-num !min-h-0 !w-20 !py-1 text-right ${own !== undefined ? "border-ink font-semibold" : ""}`}
                        inputMode="decimal"
                        placeholder="—"
                        value={texts[k] ?? ""}
                        aria-invalid={errors[k] ? true : undefined}
                        onChange={(e) => setTexts({ ...texts, [k]: e.target.value })}
                      />
                      <span className="w-12 text-left text-pencil">{unit}</span>
                    </span>
                  ) : (
                    <span id={`thr-${k}`} className={`rl-num ${own !== undefined ? "font-semibold" : ""}`}>{valueOf(view.effective, group, field)} {unit}</span>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <p className="mt-2 text-sm text-pencil">{view.effective.provenance === view.organisation.provenance ? `Organisation values: ${view.organisation.provenance}.` : ""}</p>
      {canEdit ? (
        <div className="mt-3 flex flex-wrap items-center gap-3">
          <button type="submit" className="rl-button" disabled={busy}>Save this engine's thresholds</button>
          {view.overrides ? <button type="button" className="rl-button-quiet" disabled={busy} onClick={() => void send(null)}>Follow the organisation again</button> : null}
          <p role="status" className="text-sm" data-testid="thresholds-status">{status}</p>
        </div>
      ) : null}
    </form>
  );
}
