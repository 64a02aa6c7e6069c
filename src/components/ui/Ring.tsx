import type { JSX } from "react";

/**
 * Ringland's signal mark: a ring that is whole (fine), broken once (watch) or broken twice (act),
 * so the shape carries the meaning and colour only repeats it. Engine status uses the same ring:
 * filled (running), hollow (spare), opened (on the bench), crossed (retired).
 */
export type SignalLevel = "fine" | "watch" | "act";
export type EngineStatus = "running" | "spare" | "bench" | "retired";

const LEVEL_CLASS: Record<SignalLevel, string> = { fine: "text-spruce", watch: "text-brass", act: "text-oxide" };
const LEVEL_LABEL: Record<SignalLevel, string> = { fine: "fine", watch: "watch", act: "act" };
const STATUS_LABEL: Record<EngineStatus, string> = { running: "running", spare: "spare", bench: "on the bench", retired: "retired" };

const R = 8;
const C = 2 * Math.PI * R;

interface Props {
  level?: SignalLevel;
  status?: EngineStatus;
  size?: number;
  label?: boolean;
}

export default function Ring({ level, status, size = 20, label = false }: Props): JSX.Element {
  const text = level ? LEVEL_LABEL[level] : status ? STATUS_LABEL[status] : "";
  const colour = level ? LEVEL_CLASS[level] : "text-ink";
  let ring: JSX.Element;
  if (level) {
    // Gaps: none, one, or two opposite gaps, each 14 % of the circumference.
    const gaps = level === "fine" ? 0 : level === "watch" ? 1 : 2;
    const gap = C * 0.14;
    const dash = gaps === 0 ? undefined : gaps === 1 ? `${C - gap} ${gap}` : `${C / 2 - gap} ${gap}`;
    ring = <circle cx="10" cy="10" r={R} fill="none" stroke="currentColor" strokeWidth="3" strokeDasharray={dash} transform="rotate(-60 10 10)" />;
  } else {
    const s = status ?? "spare";
    ring = (
      <>
        <circle
          cx="10"
          cy="10"
          r={R}
          fill={s === "running" ? "currentColor" : "none"}
          stroke="currentColor"
          strokeWidth="2.5"
          strokeDasharray={s === "bench" ? `${C * 0.75} ${C * 0.25}` : undefined}
          transform="rotate(-45 10 10)"
        />
        {s === "retired" ? <path d="M4.5 4.5 L15.5 15.5 M15.5 4.5 L4.5 15.5" stroke="currentColor" strokeWidth="2.5" /> : null}
      </>
    );
  }
  return (
    <span className={`inline-flex items-center gap-1.5 ${colour}`}>
      <svg width={size} height={size} viewBox="0 0 20 20" role="img" aria-label={text} focusable="false">
        <title>{text}</title>
        {ring}
      </svg>
      {label ? <span className="text-sm font-semibold">{text}</span> : null}
    </span>
  );
}
