/**
 * The Speed figures as markdown, the targets they are held to, and the one place they are kept:
 * docs/quality.md, under "## Speed", between two markers. Whatever else that file holds (other
 * headings, notes written by hand inside the Speed section outside the markers) is left alone.
 */
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import type { LoadResult } from "./http-load.ts";
import type { PageWeight } from "./page-weight.ts";

export const TARGETS = {
  floorShareMin: 0.5,
  p99MaxMsAt50: 250,
  overviewJsMaxKb: 100,
  seasonJsMaxKb: 250,
} as const;

export interface SpeedRun {
  command: string;
  startedAt: Date;
  machine: string;
  fleet: string;
  loads: LoadResult[];
  /** Ringland's roster rows and the floor's, by connections. */
  floorPairs: { connections: number; ringland: LoadResult; floor: LoadResult }[];
  pages: PageWeight[];
  /** Which page labels the JavaScript targets apply to. */
  overviewLabel: string;
  seasonLabel: string;
  paths: Record<string, string>;
}

export interface TargetCheck {
  met: boolean;
  text: string;
}

const BEGIN = "<!-- speed:begin (written by `npm run bench`; edit outside these markers) -->";
const END = "<!-- speed:end -->";
const KB = 1024;

const n0 = (v: number): string => Math.round(v).toLocaleString("en");
const n1 = (v: number): string => v.toFixed(1);
const kb = (bytes: number): string => (bytes / KB).toFixed(1);

export function checkTargets(run: SpeedRun): TargetCheck[] {
  const out: TargetCheck[] = [];
  for (const pair of run.floorPairs) {
    const share = pair.floor.requestsPerSecond > 0 ? pair.ringland.requestsPerSecond / pair.floor.requestsPerSecond : 0;
    out.push({
      met: share >= TARGETS.floorShareMin,
      text: `Roster at ${pair.connections} connections: ${(share * 100).toFixed(0)} % of the floor's throughput (target at least ${TARGETS.floorShareMin * 100} %)`,
    });
  }
  for (const r of run.loads.filter((l) => l.connections === 50 && !l.name.startsWith("Floor"))) {
    const floor = run.floorPairs.find((p) => p.ringland === r)?.floor;
    const context = floor ? `; the floor, same SQL without the framework: p99 ${n1(floor.p99Ms)} ms` : "";
    out.push({ met: r.p99Ms < TARGETS.p99MaxMsAt50, text: `${r.name} at 50 connections: p99 ${n1(r.p99Ms)} ms (target under ${TARGETS.p99MaxMsAt50} ms${context})` });
  }
  const failures = run.loads.reduce((sum, l) => sum + l.errors + l.non2xx, 0);
  out.push({ met: failures === 0, text: `Errors and non-2xx answers over every run: ${failures} (target 0)` });
  for (const [label, max] of [
    [run.overviewLabel, TARGETS.overviewJsMaxKb],
    [run.seasonLabel, TARGETS.seasonJsMaxKb],
  ] as const) {
    const page = run.pages.find((p) => p.label === label);
    out.push({
      met: page !== undefined && page.status === 200 && page.gzipBytes < max * KB,
      text: page ? `${label}: ${kb(page.gzipBytes)} KB of JavaScript gzipped (target under ${max} KB)` : `${label}: not measured`,
    });
  }
  return out;
}

export function renderSpeed(run: SpeedRun): string {
  const lines: string[] = [];
  lines.push(`Command: \`${run.command}\` (run ${run.startedAt.toISOString().slice(0, 16).replace("T", " ")} UTC).`, "");
  lines.push(`Machine: ${run.machine}`, "");
  lines.push(`Data: ${run.fleet}`, "");
  lines.push("### Load (autocannon on loopback, signed in)", "");
  lines.push("| target | request | connections | requests | req/s | p50 ms | p95 ms | p99 ms | max ms | errors (timeouts) | non-2xx |");
  lines.push("| --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |");
  for (const r of run.loads) {
    lines.push(
      `| ${r.name} | \`${run.paths[r.name] ?? ""}\` | ${r.connections} | ${n0(r.requests)} | ${n0(r.requestsPerSecond)} | ${n1(r.p50Ms)} | ${n1(r.p95Ms)} | ${n1(r.p99Ms)} | ${n1(r.maxMs)} | ${r.errors} (${r.timeouts}) | ${r.non2xx} |`,
    );
  }
  lines.push("", "### The roster against the floor (node:http + mysql2, same SQL, same database)", "");
  lines.push("| connections | Ringland req/s | floor req/s | Ringland / floor | Ringland p99 ms | floor p99 ms |");
  lines.push("| ---: | ---: | ---: | ---: | ---: | ---: |");
  for (const p of run.floorPairs) {
    const share = p.floor.requestsPerSecond > 0 ? p.ringland.requestsPerSecond / p.floor.requestsPerSecond : 0;
    lines.push(`| ${p.connections} | ${n0(p.ringland.requestsPerSecond)} | ${n0(p.floor.requestsPerSecond)} | ${share.toFixed(2)} | ${n1(p.ringland.p99Ms)} | ${n1(p.floor.p99Ms)} |`);
  }
  lines.push("", "### JavaScript sent to the browser per page (KB = 1,024 bytes)", "");
  lines.push("| page | status | files | raw KB | gzip KB | target |");
  lines.push("| --- | ---: | ---: | ---: | ---: | --- |");
  for (const p of run.pages) {
    const target = p.label === run.overviewLabel ? `< ${TARGETS.overviewJsMaxKb} KB` : p.label === run.seasonLabel ? `< ${TARGETS.seasonJsMaxKb} KB` : "";
    lines.push(`| \`${p.label}\` | ${p.status} | ${p.files} | ${kb(p.rawBytes)} | ${kb(p.gzipBytes)} | ${target} |`);
  }
  lines.push("", "### Targets", "");
  for (const t of checkTargets(run)) lines.push(`- ${t.met ? "**met**" : "**MISSED**"}: ${t.text}`);
  return lines.join("\n");
}

/** Replaces the figures between the markers of the Speed section, creating what is missing. */
export function writeSpeedSection(file: string, body: string): void {
  const block = `${BEGIN}\n\n${body}\n\n${END}`;
  let text = existsSync(file) ? readFileSync(file, "utf8") : "# Quality figures\n\nEach figure below comes with the command that produced it; run it again to check it.\n";
  const begin = text.indexOf(BEGIN);
  const end = text.indexOf(END);
  if (begin >= 0 && end > begin) {
    text = text.slice(0, begin) + block + text.slice(end + END.length);
  } else {
    const heading = /^## Speed[ \t]*$/m.exec(text);
    if (heading) {
      const rest = text.slice(heading.index + heading[0].length);
      const next = /^## /m.exec(rest);
      const at = next ? heading.index + heading[0].length + next.index : text.length;
      text = `${text.slice(0, at).replace(/\s*$/, "")}\n\n${block}\n\n${text.slice(at)}`;
    } else {
      text = `${text.replace(/\s*$/, "")}\n\n## Speed\n\n${block}\n`;
    }
  }
  writeFileSync(file, text.replace(/\s*$/, "\n"));
}
