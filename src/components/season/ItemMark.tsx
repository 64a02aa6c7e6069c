import type { JSX } from "react";

// Ringland's ring, used on the calendar: a filled ring for an event (engines run), an opened
// ring for a bench job (the engine is on the bench), a ring broken once for a projected due
// date (watch) and twice for a conflict (act). Shape carries the meaning; colour repeats it.

export type MarkKind = "event" | "important" | "job-planned" | "job-in_progress" | "job-done" | "due" | "act";

const R = 7;
const C = 2 * Math.PI * R;
const COLOUR: Record<MarkKind, string> = {
  event: "text-ink",
  important: "text-ink",
  "job-planned": "text-spruce",
  "job-in_progress": "text-brass",
  "job-done": "text-pencil",
  due: "text-brass",
  act: "text-oxide",
};
const LABEL: Record<MarkKind, string> = {
  event: "event",
  important: "important event",
  "job-planned": "planned job",
  "job-in_progress": "job on the bench",
  "job-done": "finished job",
  due: "projected due date",
  act: "conflict",
};

export default function ItemMark({ kind, size = 14, title = true }: { kind: MarkKind; size?: number; title?: boolean }): JSX.Element {
  let shape: JSX.Element;
  if (kind === "event" || kind === "important") {
    shape = (
      <>
        <circle cx="9" cy="9" r={kind === "important" ? 4.5 : R} fill="currentColor" />
        {kind === "important" ? <circle cx="9" cy="9" r={R + 0.6} fill="none" stroke="currentColor" strokeWidth="1.6" /> : null}
      </>
    );
  } else if (kind.startsWith("job")) {
    shape = <circle cx="9" cy="9" r={R} fill="none" stroke="currentColor" strokeWidth="2.6" strokeDasharray={`${C * 0.75} ${C * 0.25}`} transform="rotate(-45 9 9)" />;
  } else {
    const gap = C * 0.16;
    const dash = kind === "due" ? `${C - gap} ${gap}` : `${C / 2 - gap} ${gap}`;
    shape = <circle cx="9" cy="9" r={R} fill="none" stroke="currentColor" strokeWidth="2.6" strokeDasharray={dash} transform="rotate(-60 9 9)" />;
  }
  return (
    <span className={`inline-flex shrink-0 ${COLOUR[kind]}`}>
      <svg width={size} height={size} viewBox="0 0 18 18" role="img" aria-label={LABEL[kind]} focusable="false">
        {title ? <title>{LABEL[kind]}</title> : null}
        {shape}
      </svg>
    </span>
  );
}

export function markForJobState(state: string): MarkKind {
  return state === "in_progress" ? "job-in_progress" : state === "done" ? "job-done" : "job-planned";
}
