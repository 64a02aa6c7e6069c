import { createRequire } from "node:module";
import PDFDocument from "pdfkit";
import { formatQuantity, type UnitChoice } from "../lib/domain/units.ts";
import { describeCompliance, describeReadingRows, describeSpread } from "../components/motors/reading-rows.ts";
import { formatSheetUsage, type BuildSheet } from "./services/motors-ui-build-sheet-service.ts";

// The build sheet as an A4 PDF: the same words as the printable page, laid out with pdfkit.
// Barlow is embedded when its files are found; otherwise the built-in Helvetica is used and the
// few characters it lacks are spelled out.

type Doc = InstanceType<typeof PDFDocument>;

const MARGIN = 42;
const INK = "#26241f";
const PENCIL = "#58534b";
const RULE = "#b8ae9c";
const OXIDE = "#a84218";

interface Fonts {
  regular: string;
  bold: string;
  embedded: boolean;
}

function loadFonts(doc: Doc): Fonts {
  try {
    const require = createRequire(import.meta.url);
    doc.registerFont("Barlow", require.resolve("@fontsource/barlow/files/barlow-latin-400-normal.woff"));
    doc.registerFont("Barlow-Bold", require.resolve("@fontsource/barlow/files/barlow-latin-600-normal.woff"));
    return { regular: "Barlow", bold: "Barlow-Bold", embedded: true };
  } catch {
    return { regular: "Helvetica", bold: "Helvetica-Bold", embedded: false };
  }
}

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];
function day(on: string): string {
  const [y, m, d] = on.slice(0, 10).split("-").map(Number);
  return `${d} ${MONTHS[m - 1]} ${y}`;
}

class SheetWriter {
  readonly width: number;
  constructor(
    readonly doc: Doc,
    readonly fonts: Fonts,
  ) {
    this.width = doc.page.width - MARGIN * 2;
  }

  clean(text: string): string {
    return this.fonts.embedded ? text : text.replace(/−/g, "-").replace(/→/g, "->").replace(/[“”]/g, '"');
  }

  room(height: number): void {
    if (this.doc.y + height > this.doc.page.height - MARGIN) this.doc.addPage();
  }

  heading(text: string): void {
    this.room(60);
    this.doc.moveDown(0.6).font(this.fonts.bold).fontSize(12.5).fillColor(INK).text(this.clean(text), MARGIN, this.doc.y);
    this.rule(INK, 0.8);
    this.doc.moveDown(0.3);
  }

  rule(color = RULE, width = 0.5): void {
    const y = this.doc.y + 1;
    this.doc.moveTo(MARGIN, y).lineTo(MARGIN + this.width, y).lineWidth(width).strokeColor(color).stroke();
    this.doc.y = y + 2;
  }

  para(text: string, opts: { size?: number; color?: string; bold?: boolean } = {}): void {
    this.doc
      .font(opts.bold ? this.fonts.bold : this.fonts.regular)
      .fontSize(opts.size ?? 9.5)
      .fillColor(opts.color ?? INK)
      .text(this.clean(text), MARGIN, this.doc.y, { width: this.width });
  }

  /** A row of cells at fixed widths; returns after the tallest cell, with a hairline below. */
  row(cells: string[], widths: number[], opts: { bold?: boolean[]; align?: ("left" | "right")[]; color?: string[]; size?: number } = {}): void {
    const size = opts.size ?? 9;
    const heights = cells.map((c, i) => this.doc.font(opts.bold?.[i] ? this.fonts.bold : this.fonts.regular).fontSize(size).heightOfString(this.clean(c), { width: widths[i] - 6 }));
    const h = Math.max(...heights, size + 2) + 5;
    this.room(h);
    const top = this.doc.y;
    let x = MARGIN;
    cells.forEach((c, i) => {
      this.doc
        .font(opts.bold?.[i] ? this.fonts.bold : this.fonts.regular)
        .fontSize(size)
        .fillColor(opts.color?.[i] ?? INK)
        .text(this.clean(c), x + (i === 0 ? 0 : 3), top + 2.5, { width: widths[i] - 6, align: opts.align?.[i] ?? "left" });
      x += widths[i];
    });
    this.doc.y = top + h;
    this.doc.moveTo(MARGIN, this.doc.y).lineTo(MARGIN + this.width, this.doc.y).lineWidth(0.4).strokeColor(RULE).stroke();
  }
}

function writeHeader(w: SheetWriter, s: BuildSheet): void {
  const { doc, fonts } = w;
  doc.font(fonts.regular).fontSize(8.5).fillColor(PENCIL).text(w.clean(`${s.organisationName.toUpperCase()} · BUILD SHEET`), MARGIN, MARGIN, { characterSpacing: 1 });
  doc.font(fonts.bold).fontSize(24).fillColor(INK).text(w.clean(s.engine.name), MARGIN, doc.y + 2);
  const status = { running: "running", bench: "on the bench", spare: "spare", retired: "retired" }[s.engine.status];
  w.para(`Status: ${status} · ${s.installation ? `in chassis ${s.installation.chassisNumber}` : "not in a chassis"} · printed ${day(s.printedOn)}`, { color: PENCIL });
  w.rule(INK, 1.2);
}

function writeSpec(w: SheetWriter, s: BuildSheet): void {
  w.heading("Build spec");
  const half = w.width / 2;
  for (let i = 0; i < s.spec.length; i += 2) {
    const a = s.spec[i];
    const b = s.spec[i + 1];
    w.row([a.label, a.value, b?.label ?? "", b?.value ?? ""], [half * 0.45, half * 0.55, half * 0.45, half * 0.55], {
      color: [PENCIL, INK, PENCIL, INK],
      align: ["left", "right", "left", "right"],
    });
  }
  const c = s.counters;
  w.doc.moveDown(0.3);
  w.para(
    `Usage since new ${formatSheetUsage(c.sinceNew, s.unit)} · since top end ${formatSheetUsage(c.topEnd.used, s.unit)}${c.topEnd.lastOn ? ` (rebuilt ${day(c.topEnd.lastOn)})` : ""} · since bottom end ${formatSheetUsage(c.bottomEnd.used, s.unit)}${c.bottomEnd.lastOn ? ` (rebuilt ${day(c.bottomEnd.lastOn)})` : ""}`,
  );
}

function writeReadings(w: SheetWriter, s: BuildSheet, units: UnitChoice): void {
  w.heading("Latest readings per cylinder");
  const set = s.latest;
  if (!set) {
    w.para("No readings recorded.", { color: PENCIL });
    return;
  }
  const kind = { teardown: "teardown", between_events: "between events", build: "build" }[set.setKind];
  w.para(
    `Taken ${day(set.takenOn)} (${kind}${set.isBaseline ? ", baseline" : ""}) at ${formatQuantity("elevation", set.elevationM, units)}${set.airTempC !== null ? `, ${formatQuantity("temperature", set.airTempC, units)}` : ""}${set.takenBy ? ` by ${set.takenBy.name}` : ""}.${s.baseline && s.baseline.id !== set.id ? ` Baseline of ${day(s.baseline.takenOn)}.` : ""}`,
  );
  w.doc.moveDown(0.3);
  const cylinders = [...set.cylinders].map((c) => c.cylinderNo).sort((a, b) => a - b);
  const labelWidth = w.width * 0.36;
  const cell = (w.width - labelWidth) / Math.max(cylinders.length, 1);
  const widths = [labelWidth, ...cylinders.map(() => cell)];
  w.row(["Cylinder", ...cylinders.map(String)], widths, { bold: widths.map(() => true), align: ["left", ...cylinders.map(() => "right" as const)], color: [PENCIL] });
  for (const r of describeReadingRows(set, units)) {
    w.row([r.label, ...r.cells], widths, { bold: [false, ...r.cells.map(() => r.strong)], align: ["left", ...r.cells.map(() => "right" as const)], color: [PENCIL] });
  }
  const spread = describeSpread(set, units);
  if (spread) {
    w.doc.moveDown(0.3);
    w.para(`Spread between cylinders: ${spread}`);
  }
}

function writeCompliance(w: SheetWriter, s: BuildSheet, units: UnitChoice): void {
  w.heading("Class compliance");
  const c = s.latest?.figures.compliance;
  if (!c) {
    w.para(s.racingClass ? `No readings to check against ${s.racingClass.name} yet.` : "This engine is not entered in a racing class.", { color: PENCIL });
    return;
  }
  const words = describeCompliance(c, units);
  w.para(words.verdict, { bold: true, color: c.compliant === false ? OXIDE : INK });
  for (const k of words.checks) w.para(`•  ${k.text}`, { color: k.pass === false ? OXIDE : INK, bold: k.pass === false });
  if (c.squishWireNote) w.para(`How the class reads squish: ${c.squishWireNote}`, { color: PENCIL });
}

function writeHistory(w: SheetWriter, s: BuildSheet, units: UnitChoice): void {
  if (s.parts.length) {
    w.heading("Parts fitted");
    for (const p of s.parts) {
      const machining = [p.totalCutMm > 0 ? `cut ${formatQuantity("length", p.totalCutMm, units)}` : "", p.oversizeMm > 0 ? `+${formatQuantity("length", p.oversizeMm, units)} oversize` : ""].filter(Boolean).join(", ");
      w.row([p.kind, `${p.serial}${p.cylinderNo ? `, cylinder ${p.cylinderNo}` : ""}`, `${formatSheetUsage(p.counters.sinceNew, s.unit)}${p.usageLimit !== null ? ` of ${formatSheetUsage(p.usageLimit, s.unit)}` : ""}`, machining], [w.width * 0.15, w.width * 0.4, w.width * 0.22, w.width * 0.23], { bold: [true], align: ["left", "left", "right", "right"] });
    }
  }
  w.heading("History");
  const label: Record<string, string> = { installed: "installed", removed: "removed", service: "rebuild", reading_set: "readings", part_in: "part in", part_out: "part out", part_cut: "cut", part_oversize: "oversize" };
  for (const h of s.history) w.row([day(h.on), label[h.kind] ?? h.kind, h.summary], [w.width * 0.17, w.width * 0.13, w.width * 0.7], { color: [PENCIL, PENCIL, INK] });
  if (s.historyTotal > s.history.length) w.para(`The ${s.history.length} latest of ${s.historyTotal} entries.`, { size: 8, color: PENCIL });
  if (s.usageByEvent.length) {
    w.doc.moveDown(0.5);
    w.para("Usage by event", { bold: true });
    for (const u of s.usageByEvent) {
      w.row([u.from === u.to ? day(u.from) : `${day(u.from)} – ${day(u.to)}`, u.label, formatSheetUsage(u.amount, s.unit)], [w.width * 0.32, w.width * 0.5, w.width * 0.18], { color: [PENCIL], align: ["left", "left", "right"] });
    }
  }
}

function writeClosing(w: SheetWriter, s: BuildSheet): void {
  w.heading("Cautions");
  for (const c of s.cautions) w.para(`•  ${c}`, { size: 9 });
  w.room(84);
  w.heading("Signatures");
  const col = w.width / s.signatures.length;
  const top = w.doc.y + 26;
  s.signatures.forEach((label, i) => {
    const x = MARGIN + i * col;
    w.doc.moveTo(x, top).lineTo(x + col - 18, top).lineWidth(0.8).strokeColor(INK).stroke();
    w.doc.font(w.fonts.bold).fontSize(9.5).fillColor(INK).text(label, x, top + 4, { width: col - 18 });
    w.doc.font(w.fonts.regular).fontSize(8).fillColor(PENCIL).text("name, signature and date", x, top + 17, { width: col - 18 });
  });
  w.doc.y = top + 30;
}

/** The whole sheet as PDF bytes. */
export async function renderBuildSheetPdf(sheet: BuildSheet, units: UnitChoice): Promise<Buffer> {
  const doc = new PDFDocument({
    size: "A4",
    margin: MARGIN,
    info: { Title: `Build sheet ${sheet.engine.name}`, Author: sheet.organisationName, Subject: "Engine build sheet", Creator: "Ringland" },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });
  const w = new SheetWriter(doc, loadFonts(doc));
  writeHeader(w, sheet);
  writeSpec(w, sheet);
  writeReadings(w, sheet, units);
  writeCompliance(w, sheet, units);
  writeHistory(w, sheet, units);
  writeClosing(w, sheet);
  doc.end();
  return done;
}
