import { escapeHtml } from "../services/auth-service.ts";

export interface SignalForMail {
  id: number;
  engineId: number;
  engineName: string;
  kind: string;
  severity: "watch" | "act";
  message: string;
  numbers: Record<string, number>;
  escalated?: boolean;
}

const NUMBER_LABELS: [RegExp, string][] = [
  [/Cc$/, "cc"],
  [/Mm$/, "mm"],
  [/Kpa$/, "kPa"],
  [/Pct$/, "%"],
  [/Points$/, "points"],
  [/M$/, "m"],
  [/Hours$|^used$|^limit$/, ""],
];

/** "baselineChamberCc" -> ["baseline chamber", "cc"] */
export function describeNumber(name: string): [string, string] {
  for (const [re, unit] of NUMBER_LABELS) {
    if (re.test(name)) {
      const stem = name.replace(re, "");
      return [stem.replace(/([A-Z])/g, " $1").toLowerCase().trim() || name, unit];
    }
  }
  return [name.replace(/([A-Z])/g, " $1").toLowerCase(), ""];
}

function formatValue(v: number): string {
  const abs = Math.abs(v);
  const digits = abs >= 100 ? 0 : abs >= 10 ? 1 : 2;
  return v.toFixed(digits);
}

const LEVEL = { watch: "Watch", act: "Act" } as const;

export interface ComposedMail {
  subject: string;
  text: string;
  html: string;
}

export function composeSignalMail(input: {
  organisationName: string;
  recipientName: string;
  signals: SignalForMail[];
  appUrl: string;
  unsubscribeUrl: string;
  digest: boolean;
}): ComposedMail {
  const { signals } = input;
  const first = signals[0];
  const worst = signals.some((s) => s.severity === "act") ? "act" : "watch";
  const named = (s: SignalForMail): string => (s.message.startsWith(s.engineName) ? s.message : `${s.engineName}: ${s.message}`);
  const subject = (
    input.digest
      ? `${input.organisationName}: ${signals.length} new signal${signals.length === 1 ? "" : "s"} today`
      : signals.length === 1
        ? `[${LEVEL[first.severity]}${first.escalated ? ", worse" : ""}] ${named(first)}`
        : `[${LEVEL[worst]}] ${first.engineName}: ${signals.length} signals, ${signals.filter((s) => s.severity === "act").length} to act on`
  ).slice(0, 200);
  const textParts: string[] = [`Hello ${input.recipientName},`, ""];
  const htmlParts: string[] = [`<p>Hello ${escapeHtml(input.recipientName)},</p>`];
  for (const s of signals) {
    const link = `${input.appUrl}/motors/${s.engineId}#signals`;
    const rows = Object.entries(s.numbers).map(([k, v]) => {
      const [label, unit] = describeNumber(k);
      return { label, value: `${formatValue(v)}${unit ? ` ${unit}` : ""}` };
    });
    textParts.push(
      `${LEVEL[s.severity]}${s.escalated ? " (worse than before)" : ""}: ${s.engineName}: ${s.message}`,
      ...rows.map((r) => `  ${r.label}: ${r.value}`),
      `  Engine file: ${link}`,
      "",
    );
    htmlParts.push(
      `<h2 style="font-family:sans-serif;font-size:16px;margin:16px 0 4px">${LEVEL[s.severity]}${s.escalated ? " (worse than before)" : ""}: ${escapeHtml(s.engineName)}</h2>`,
      `<p style="margin:0 0 6px">${escapeHtml(s.message)}</p>`,
      `<table cellpadding="4" style="border-collapse:collapse;font-variant-numeric:tabular-nums">${rows
        .map((r) => `<tr><td style="border-bottom:1px solid #cdc4b4">${escapeHtml(r.label)}</td><td style="border-bottom:1px solid #cdc4b4;text-align:right">${escapeHtml(r.value)}</td></tr>`)
        .join("")}</table>`,
      `<p><a href="${link}">Open the engine file</a></p>`,
    );
  }
  const footer = "Ringland raised this because a reading or the hours crossed your team's thresholds. The engine builder's specifications and the sanctioning rules come first.";
  textParts.push(footer, "", `Stop these mails: ${input.unsubscribeUrl}`);
  htmlParts.push(`<p style="color:#58534b;font-size:13px">${footer}</p>`, `<p style="font-size:13px"><a href="${input.unsubscribeUrl}">Stop these mails</a></p>`);
  return { subject, text: textParts.join("\n"), html: htmlParts.join("\n") };
}
