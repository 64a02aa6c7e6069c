import { describe, it, expect } from "vitest";
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { gzipSync } from "node:zlib";
import { pickPercentile, type LoadResult } from "../../../bench/http-load.ts";
import { findPageScripts, ScriptWeigher } from "../../../bench/page-weight.ts";
import { checkTargets, writeSpeedSection, type SpeedRun } from "../../../bench/speed-report.ts";

describe("pickPercentile", () => {
  it("takes the nearest rank: the smallest value with at least p % of the values at or below it", () => {
    const values = Array.from({ length: 100 }, (_, i) => i + 1);
    expect(pickPercentile(values, 50)).toBe(50);
    expect(pickPercentile(values, 95)).toBe(95);
    expect(pickPercentile(values, 99)).toBe(99);
    expect(pickPercentile([7], 99)).toBe(7);
    expect(pickPercentile([], 50)).toBe(0);
  });
});

describe("findPageScripts", () => {
  it("finds module scripts, island component and renderer URLs and modulepreload links, and keeps inline scripts apart", () => {
    const html = `<html><head>
      <script type="module" src="/_astro/page.A1.js"></script>
      <script type="application/ld+json">{"a":1}</script>
      <link rel="modulepreload" href="/_astro/pre.B2.js">
      <script>(()=>{var a=1})()</script>
      </head><body>
      <astro-island uid="x" component-url="/_astro/Roster.C3.js" renderer-url="/_astro/client.D4.js" props="{}"></astro-island>
      <astro-island uid="y" component-url="/_astro/Ring.E5.js" renderer-url="/_astro/client.D4.js"></astro-island>
      </body></html>`;
    const { urls, inline } = findPageScripts(html);
    expect(urls.sort()).toEqual(["/_astro/Ring.E5.js", "/_astro/Roster.C3.js", "/_astro/client.D4.js", "/_astro/page.A1.js", "/_astro/pre.B2.js"]);
    expect(inline).toEqual(["(()=>{var a=1})()"]);
  });
});

describe("ScriptWeigher", () => {
  it("follows static imports and re-exports once each, not dynamic import(), and sums gzip sizes file by file", () => {
    const dir = mkdtempSync(join(tmpdir(), "ringland-weigh-"));
    mkdirSync(join(dir, "_astro"));
    const files: Record<string, string> = {
      "entry.js": `import{a as b}from"./shared.js";import"./side.js";export*from"./more.js";const l=()=>import("./lazy.js");`,
      "shared.js": `export const a=1;`,
      "side.js": `import{a}from"./shared.js";console.log(a);`,
      "more.js": `export const m=2;`,
      "lazy.js": `export const big="${"x".repeat(5000)}";`,
    };
    for (const [name, text] of Object.entries(files)) writeFileSync(join(dir, "_astro", name), text);
    const w = new ScriptWeigher(dir).weigh(["/_astro/entry.js", "/_astro/missing.js"]);
    const counted = ["entry.js", "shared.js", "side.js", "more.js"];
    expect(w.files).toBe(4);
    expect(w.missing).toEqual(["/_astro/missing.js"]);
    expect(w.rawBytes).toBe(counted.reduce((n, f) => n + Buffer.byteLength(files[f]), 0));
    expect(w.gzipBytes).toBe(counted.reduce((n, f) => n + gzipSync(Buffer.from(files[f]), { level: 9 }).length, 0));
  });
});

function load(name: string, connections: number, rps: number, p99Ms: number, errors = 0): LoadResult {
  return { name, connections, seconds: 10, requests: rps * 10, requestsPerSecond: rps, p50Ms: 1, p95Ms: 1, p99Ms, maxMs: p99Ms, errors, timeouts: 0, non2xx: 0, statusCodes: {} };
}

describe("checkTargets", () => {
  it("holds the roster to half the floor, every route to p99 under 250 ms at 50 connections, zero errors and the two page weights", () => {
    const ringland = load("Roster API", 50, 60, 240);
    const floor = load("Floor roster", 50, 100, 900);
    const run: SpeedRun = {
      command: "npm run bench",
      startedAt: new Date("2026-12-01T00:00:00Z"),
      machine: "test",
      fleet: "test",
      loads: [ringland, floor, load("Overview page", 50, 10, 260, 1)],
      floorPairs: [{ connections: 50, ringland, floor }],
      pages: [
        { label: "/", status: 200, files: 1, rawBytes: 1, gzipBytes: 99 * 1024, inlineGzipBytes: 0, missing: [] },
        { label: "/season", status: 200, files: 1, rawBytes: 1, gzipBytes: 250 * 1024, inlineGzipBytes: 0, missing: [] },
      ],
      overviewLabel: "/",
      seasonLabel: "/season",
      paths: {},
    };
    const checks = checkTargets(run);
    expect(checks.map((c) => c.met)).toEqual([true, true, false, false, true, false]);
    expect(checks[0].text).toContain("60 %");
    expect(checks[1].text).toContain("floor, same SQL without the framework: p99 900.0 ms");
  });
});

describe("writeSpeedSection", () => {
  it("creates the file with a Speed heading, then replaces only what lies between its markers", () => {
    const file = join(mkdtempSync(join(tmpdir(), "ringland-quality-")), "quality.md");
    writeSpeedSection(file, "first figures");
    expect(readFileSync(file, "utf8")).toMatch(/## Speed\n\n<!-- speed:begin[^\n]*-->\n\nfirst figures\n\n<!-- speed:end -->\n$/);
    const withOthers = readFileSync(file, "utf8") + "\nA note of ours.\n\n## Security\n\nSomeone else's table.\n";
    writeFileSync(file, withOthers);
    writeSpeedSection(file, "second figures");
    const text = readFileSync(file, "utf8");
    expect(text).toContain("second figures");
    expect(text).not.toContain("first figures");
    expect(text).toContain("A note of ours.");
    expect(text).toContain("## Security\n\nSomeone else's table.");
  });

  it("adds its block under an existing Speed heading written by someone else, before the next heading", () => {
    const file = join(mkdtempSync(join(tmpdir(), "ringland-quality-")), "quality.md");
    writeFileSync(file, "# Quality\n\n## Speed\n\nIntro.\n\n## Faults\n\nTheirs.\n");
    writeSpeedSection(file, "figures");
    const text = readFileSync(file, "utf8");
    expect(text.indexOf("Intro.")).toBeLessThan(text.indexOf("figures"));
    expect(text.indexOf("figures")).toBeLessThan(text.indexOf("## Faults"));
    expect(text).toContain("## Faults\n\nTheirs.");
  });
});
