/**
 * How much JavaScript each page sends to the browser, gzipped. A page is fetched as a browser
 * would get it; its module scripts (<script type="module" src>), its islands' component and
 * renderer URLs and any modulepreload links are followed through their static imports in the
 * built client folder, each file is gzipped once (level 9, as a server would send it), and
 * inline scripts (Astro's island loader) are gzipped per page. Dynamic import() is not
 * followed: it is loaded only when the code asks for it.
 */
import { existsSync, readFileSync } from "node:fs";
import { dirname, join, normalize, resolve } from "node:path";
import { gzipSync } from "node:zlib";

export interface PageToWeigh {
  label: string;
  url: string;
  cookie?: string;
}

export interface PageWeight {
  label: string;
  status: number;
  files: number;
  rawBytes: number;
  gzipBytes: number;
  inlineGzipBytes: number;
  /** Script URLs that were not found in the client folder (should be none). */
  missing: string[];
}

const STATIC_IMPORT = /(?:^|[^\w$.])(?:import|export)\s*(?:[\w$*{}\s,]+?\s*from\s*)?["']([^"'\n]+\.m?js)["']/g;

function attribute(attrs: string, name: string): string | null {
  const m = new RegExp(`(?:^|\\s)${name}\\s*=\\s*(?:"([^"]*)"|'([^']*)'|([^\\s>]+))`, "i").exec(attrs);
  return m ? (m[1] ?? m[2] ?? m[3] ?? "").replace(/&amp;/g, "&") : null;
}

/** The script URLs a page names, and the text of its inline scripts. */
export function findPageScripts(html: string): { urls: string[]; inline: string[] } {
  const urls = new Set<string>();
  const inline: string[] = [];
  for (const m of html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/gi)) {
    const type = (attribute(m[1], "type") ?? "").toLowerCase();
    if (type && type !== "module" && type !== "text/javascript") continue;
    const src = attribute(m[1], "src");
    if (src) urls.add(src);
    else if (m[2].trim()) inline.push(m[2]);
  }
  for (const m of html.matchAll(/<astro-island\b([^>]*)>/gi)) {
    for (const name of ["component-url", "renderer-url", "before-hydration-url"]) {
      const v = attribute(m[1], name);
      if (v) urls.add(v);
    }
  }
  for (const m of html.matchAll(/<link\b([^>]*)>/gi)) {
    if ((attribute(m[1], "rel") ?? "").toLowerCase() === "modulepreload") {
      const href = attribute(m[1], "href");
      if (href) urls.add(href);
    }
  }
  return { urls: [...urls], inline };
}

/** Maps a same-origin script URL to its file in the client folder, or null. */
function toFile(clientDir: string, url: string): string | null {
  if (/^[a-z]+:\/\//i.test(url) || url.startsWith("//")) return null;
  const path = url.split(/[?#]/)[0];
  const file = normalize(join(clientDir, path));
  return file.startsWith(resolve(clientDir)) ? file : null;
}

export class ScriptWeigher {
  private gzipCache = new Map<string, { raw: number; gzip: number; imports: string[] }>();

  constructor(private readonly clientDir: string) {}

  private read(file: string): { raw: number; gzip: number; imports: string[] } {
    const hit = this.gzipCache.get(file);
    if (hit) return hit;
    const text = readFileSync(file);
    const imports: string[] = [];
    for (const m of text.toString("utf8").matchAll(STATIC_IMPORT)) {
      const spec = m[1];
      if (spec.startsWith("./") || spec.startsWith("../")) imports.push(resolve(dirname(file), spec));
      else if (spec.startsWith("/")) imports.push(join(this.clientDir, spec));
    }
    const entry = { raw: text.length, gzip: gzipSync(text, { level: 9 }).length, imports };
    this.gzipCache.set(file, entry);
    return entry;
  }

  /** Every file the given URLs load, with their static imports, each counted once. */
  weigh(urls: string[]): { files: number; rawBytes: number; gzipBytes: number; missing: string[] } {
    const seen = new Set<string>();
    const missing: string[] = [];
    const queue: string[] = [];
    for (const url of urls) {
      const file = toFile(this.clientDir, url);
      if (file && existsSync(file)) queue.push(file);
      else missing.push(url);
    }
    let rawBytes = 0;
    let gzipBytes = 0;
    while (queue.length) {
      const file = queue.shift()!;
      if (seen.has(file)) continue;
      seen.add(file);
      const w = this.read(file);
      rawBytes += w.raw;
      gzipBytes += w.gzip;
      for (const dep of w.imports) if (!seen.has(dep) && existsSync(dep)) queue.push(dep);
    }
    return { files: seen.size, rawBytes, gzipBytes, missing };
  }
}

/** Fetches each page (following no redirect) and weighs the JavaScript it would load. */
export async function measurePageWeights(pages: PageToWeigh[], clientDir: string): Promise<PageWeight[]> {
  const weigher = new ScriptWeigher(clientDir);
  const out: PageWeight[] = [];
  for (const page of pages) {
    const res = await fetch(page.url, { headers: page.cookie ? { cookie: page.cookie } : {}, redirect: "manual", signal: AbortSignal.timeout(30_000) });
    const html = await res.text();
    const { urls, inline } = findPageScripts(html);
    const w = weigher.weigh(urls);
    const inlineText = Buffer.from(inline.join("\n"));
    const inlineGzipBytes = inline.length ? gzipSync(inlineText, { level: 9 }).length : 0;
    out.push({ label: page.label, status: res.status, files: w.files, rawBytes: w.rawBytes + inlineText.length, gzipBytes: w.gzipBytes + inlineGzipBytes, inlineGzipBytes, missing: w.missing });
  }
  return out;
}
