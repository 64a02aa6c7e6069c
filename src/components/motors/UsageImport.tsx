import { useMutation } from "@tanstack/react-query";
import { useState, type ChangeEvent, type JSX } from "react";
import type { UsageUnit } from "../../lib/motors/types.ts";
import { postWithProgress, readFile } from "./import-transfer.ts";
import { ApiError, formatDate, formatUsage } from "./motors-api.ts";
import QueryRoot from "./QueryRoot.tsx";

// Usage from a spreadsheet in three steps: choose the file, say which column is which, look at
// exactly what will be written (and every bad row with its reason), then write it in one go.
// Rows already imported from an earlier file are recognised and skipped, never counted twice.

interface Mapping {
  engine: string;
  date: string;
  amount: string;
  session?: string | null;
  event?: string | null;
  notes?: string | null;
}
type DateFormat = "iso" | "mdy" | "dmy";

interface Preview {
  columns: string[];
  mapping: Mapping | null;
  dateFormat: DateFormat;
  rows: { line: number; engineName: string; occurredOn: string; amount: number; sessionLabel: string | null; eventLabel: string | null; duplicate: boolean }[];
  errors: { line: number; field: string; reason: string; value: string | null }[];
  summary: { rowsRead: number; toWrite: number; duplicates: number; bad: number; amountToWrite: number };
}

interface Result {
  written: number;
  duplicates: number;
  skippedBad: number;
  amountWritten: number;
}

interface Progress {
  label: string;
  /** 0..1, or null while the server works without telling how far it is. */
  fraction: number | null;
}

const ROWS_SHOWN = 300;
const ROLE_LABEL: Record<keyof Mapping, string> = { engine: "Engine (name or serial)", date: "Date", amount: "Usage", session: "Session", event: "Event or venue", notes: "Notes" };
const FORMAT_LABEL: Record<DateFormat, string> = { iso: "2026-03-07 (year first)", mdy: "3/7/2026 (month first)", dmy: "7/3/2026 (day first)" };

function ProgressBar({ progress }: { progress: Progress }): JSX.Element {
  return (
    <div className="my-3" data-testid="import-progress">
      <p className="mb-1 text-sm font-semibold">{progress.label}</p>
      {progress.fraction === null ? (
        <progress className="h-2 w-full accent-ink" aria-label={progress.label} />
      ) : (
        <progress className="h-2 w-full accent-ink" max={100} value={Math.round(progress.fraction * 100)} aria-label={progress.label} />
      )}
    </div>
  );
}

interface Props {
  usageUnit: UsageUnit;
  /** The server's limits per file (passed in, so the island does not carry the schemas). */
  maxRows: number;
  maxChars: number;
}

function ImportView({ usageUnit, maxRows, maxChars }: Props): JSX.Element {
  const [fileName, setFileName] = useState("");
  const [csv, setCsv] = useState("");
  const [mapping, setMapping] = useState<Mapping | null>(null);
  const [dateFormat, setDateFormat] = useState<DateFormat>("iso");
  const [preview, setPreview] = useState<Preview | null>(null);
  const [result, setResult] = useState<Result | null>(null);
  const [skipBad, setSkipBad] = useState(false);
  const [progress, setProgress] = useState<Progress | null>(null);
  const [problem, setProblem] = useState("");
  const busy = progress !== null;
  const previewCall = useMutation({
    mutationFn: (body: unknown) =>
      postWithProgress<Preview>("/api/v1/usage/import/preview", body, (f) =>
        setProgress(f < 1 ? { label: "Sending the file…", fraction: f } : { label: "Checking every row…", fraction: null }),
      ),
  });
  const commitCall = useMutation({
    mutationFn: (body: unknown) =>
      postWithProgress<Result>("/api/v1/usage/import/commit", body, (f) =>
        setProgress(f < 1 ? { label: "Sending the file…", fraction: f } : { label: `Writing ${preview?.summary.toWrite ?? ""} rows in one go…`, fraction: null }),
      ),
  });

  async function check(text: string, m: Mapping | null, format: DateFormat): Promise<void> {
    setProblem("");
    setResult(null);
    setProgress({ label: "Sending the file…", fraction: 0 });
    try {
      const p = await previewCall.mutateAsync({ csv: text, ...(m ? { mapping: m } : {}), dateFormat: format });
      setPreview(p);
      setMapping(p.mapping);
      setSkipBad(false);
    } catch (err) {
      setPreview(null);
      const fields = err instanceof ApiError ? Object.values(err.fields) : [];
      setProblem([(err as Error).message, ...fields].filter((v, i, a) => a.indexOf(v) === i).join(" "));
    } finally {
      setProgress(null);
    }
  }

  async function chooseFile(e: ChangeEvent<HTMLInputElement>): Promise<void> {
    const file = e.target.files?.[0];
    if (!file) return;
    setFileName(file.name);
    setPreview(null);
    setResult(null);
    setMapping(null);
    setProgress({ label: `Reading ${file.name}…`, fraction: 0 });
    let text: string;
    try {
      text = await readFile(file, (f) => setProgress({ label: `Reading ${file.name}…`, fraction: f }));
    } catch (err) {
      setProgress(null);
      setProblem((err as Error).message);
      return;
    }
    if (text.length > maxChars) {
      setProgress(null);
      setProblem(`This file is larger than ${Math.round((maxChars / 1_000_000) * 10) / 10} MB: split it into parts of at most ${maxRows} rows and import them one after another.`);
      return;
    }
    setCsv(text);
    await check(text, null, dateFormat);
  }

  async function commit(): Promise<void> {
    if (!preview || !mapping) return;
    setProblem("");
    setProgress({ label: "Sending the file…", fraction: 0 });
    try {
      const r = await commitCall.mutateAsync({ csv, mapping, dateFormat, skipBadRows: skipBad });
      setResult(r);
      setPreview(null);
    } catch (err) {
      setProblem(`Nothing was written. ${(err as Error).message}`);
    } finally {
      setProgress(null);
    }
  }

  const setRole = (role: keyof Mapping, column: string): void => {
    const base: Mapping = mapping ?? { engine: "", date: "", amount: "" };
    setMapping({ ...base, [role]: column === "" ? (role === "engine" || role === "date" || role === "amount" ? "" : null) : column });
  };
  const mappingComplete = Boolean(mapping?.engine && mapping.date && mapping.amount);
  const columns = preview?.columns ?? [];
  const s = preview?.summary;
  const canWrite = Boolean(preview && mappingComplete && s && s.toWrite > 0 && (s.bad === 0 || skipBad));

  return (
    <div className="space-y-5" data-testid="usage-import">
      <div>
        <label className="rl-label" htmlFor="import-file">CSV file</label>
        <input id="import-file" type="file" accept=".csv,text/csv,text/plain" className="rl-field" onChange={(e) => void chooseFile(e)} disabled={busy} data-testid="import-file" />
        <p className="mt-1 text-sm text-pencil">One row per session, with a header row. Up to {maxRows} rows and {Math.round((maxChars / 1_000_000) * 10) / 10} MB per file. Usage is read in {usageUnit}.</p>
      </div>
      {progress ? <ProgressBar progress={progress} /> : null}
      {problem ? <p className="rl-caution !text-base font-semibold" role="alert" data-testid="import-problem">{problem}</p> : null}
      {result ? (
        <div className="rl-notice !border-spruce" role="status" data-testid="import-result">
          <p className="font-semibold">Written: {result.written} session{result.written === 1 ? "" : "s"}, {formatUsage(result.amountWritten, usageUnit)}.</p>
          <p>{result.duplicates ? `${result.duplicates} row${result.duplicates === 1 ? " was" : "s were"} imported before and skipped: nothing counts twice.` : "No row had been imported before."}{result.skippedBad ? ` ${result.skippedBad} bad row${result.skippedBad === 1 ? "" : "s"} left out.` : ""}</p>
        </div>
      ) : null}

      {preview ? (
        <section aria-labelledby="map-h" className="space-y-3">
          <h2 id="map-h">Columns of {fileName}</h2>
          <div className="grid gap-3 sm:grid-cols-3">
            {(Object.keys(ROLE_LABEL) as (keyof Mapping)[]).map((role) => (
              <div key={role}>
                <label className="rl-label" htmlFor={`map-${role}`}>{ROLE_LABEL[role]}{role === "engine" || role === "date" || role === "amount" ? "" : " (optional)"}</label>
                <select id={`map-${role}`} className="rl-field" value={mapping?.[role] ?? ""} onChange={(e) => setRole(role, e.target.value)}>
                  <option value="">{role === "engine" || role === "date" || role === "amount" ? "Choose a column…" : "none"}</option>
                  {columns.map((c) => <option key={c} value={c}>{c}</option>)}
                </select>
              </div>
            ))}
            <div>
              <label className="rl-label" htmlFor="map-format">Dates are written as</label>
              <select id="map-format" className="rl-field" value={dateFormat} onChange={(e) => setDateFormat(e.target.value as DateFormat)}>
                {(Object.keys(FORMAT_LABEL) as DateFormat[]).map((f) => <option key={f} value={f}>{FORMAT_LABEL[f]}</option>)}
              </select>
            </div>
          </div>
          <button type="button" className="rl-button-quiet" disabled={busy || !mappingComplete} onClick={() => void check(csv, mapping, dateFormat)}>Check again with these columns</button>
          {!preview.mapping ? <p className="text-sm font-semibold text-brass">Say which columns hold the engine, the date and the usage, then check again.</p> : null}
        </section>
      ) : null}

      {preview && preview.mapping && s ? (
        <section aria-labelledby="preview-h" className="space-y-4">
          <h2 id="preview-h">What will be written</h2>
          <dl className="grid grid-cols-2 gap-x-6 border-y-hair border-rule py-2 text-sm sm:grid-cols-5" data-testid="import-summary">
            <div><dt className="text-pencil">Rows read</dt><dd className="rl-num text-lg font-semibold">{s.rowsRead}</dd></div>
            <div><dt className="text-pencil">To write</dt><dd className="rl-num text-lg font-semibold" data-testid="import-to-write">{s.toWrite}</dd></div>
            <div><dt className="text-pencil">Usage to add</dt><dd className="rl-num text-lg font-semibold">{formatUsage(s.amountToWrite, usageUnit)}</dd></div>
            <div><dt className="text-pencil">Imported before</dt><dd className="rl-num text-lg font-semibold" data-testid="import-duplicates">{s.duplicates}</dd></div>
            <div><dt className="text-pencil">Bad rows</dt><dd className={`rl-num text-lg font-semibold ${s.bad ? "text-oxide" : ""}`} data-testid="import-bad">{s.bad}</dd></div>
          </dl>
          {s.duplicates > 0 ? <p className="rl-notice text-sm">{s.duplicates} row{s.duplicates === 1 ? " is" : "s are"} already in Ringland from an earlier import: {s.duplicates === 1 ? "it is" : "they are"} skipped, so the hours are not doubled.</p> : null}

          {preview.errors.length ? (
            <div>
              <h3 className="mb-1 font-semibold text-oxide">Bad rows, each with its reason</h3>
              <div className="max-h-80 overflow-auto border-y-hair border-rule">
                <table className="w-full border-collapse text-sm" data-testid="import-errors">
                  <thead><tr className="text-left text-pencil"><th className="py-1 pr-2">Line</th><th className="px-2">Column</th><th className="px-2">Value</th><th className="px-2">Reason</th></tr></thead>
                  <tbody>
                    {preview.errors.map((e, i) => (
                      <tr key={i} className="border-t-hair border-rule align-top">
                        <td className="rl-num py-1 pr-2">{e.line}</td>
                        <td className="px-2">{e.field === "row" ? "whole row" : (mapping?.[e.field as keyof Mapping] ?? e.field)}</td>
                        <td className="px-2 font-mono text-xs">{e.value ?? "(empty)"}</td>
                        <td className="px-2">{e.reason}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            </div>
          ) : null}

          {preview.rows.length ? (
            <div>
              <h3 className="mb-1 font-semibold">Rows</h3>
              <div className="max-h-96 overflow-auto border-y-hair border-rule">
                <table className="w-full border-collapse text-sm" data-testid="import-rows">
                  <thead><tr className="text-left text-pencil"><th className="py-1 pr-2">Line</th><th className="px-2">Engine</th><th className="px-2">Day</th><th className="px-2 text-right">Usage</th><th className="px-2">Session</th><th className="px-2">Will be</th></tr></thead>
                  <tbody>
                    {preview.rows.slice(0, ROWS_SHOWN).map((r) => (
                      <tr key={r.line} className={`border-t-hair border-rule ${r.duplicate ? "text-pencil" : ""}`}>
                        <td className="rl-num py-1 pr-2">{r.line}</td>
                        <td className="px-2 font-semibold">{r.engineName}</td>
                        <td className="rl-num px-2">{formatDate(r.occurredOn)}</td>
                        <td className="rl-num px-2 text-right">{formatUsage(r.amount, usageUnit)}</td>
                        <td className="px-2">{[r.eventLabel, r.sessionLabel].filter(Boolean).join(" · ")}</td>
                        <td className="px-2">{r.duplicate ? "skipped: imported before" : "written"}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
              {preview.rows.length > ROWS_SHOWN ? <p className="mt-1 text-sm text-pencil">The first {ROWS_SHOWN} of {preview.rows.length} good rows are shown; all of them are written.</p> : null}
            </div>
          ) : null}

          {s.bad > 0 ? (
            <label className="flex items-start gap-3">
              <input type="checkbox" className="mt-1 h-5 w-5" checked={skipBad} onChange={(e) => setSkipBad(e.target.checked)} data-testid="import-skip-bad" />
              <span>Leave out the {s.bad} bad row{s.bad === 1 ? "" : "s"} and write the others. <span className="text-pencil">Or fix them in the file and choose it again.</span></span>
            </label>
          ) : null}
          <button type="button" className="rl-button w-full sm:w-auto" disabled={busy || !canWrite} onClick={() => void commit()} data-testid="import-commit">
            {s.toWrite === 0 ? "Nothing new to write" : `Write ${s.toWrite} session${s.toWrite === 1 ? "" : "s"} (${formatUsage(s.amountToWrite, usageUnit)})`}
          </button>
        </section>
      ) : null}
    </div>
  );
}

export default function UsageImport(props: Props): JSX.Element {
  return (
    <QueryRoot>
      <ImportView {...props} />
    </QueryRoot>
  );
}
