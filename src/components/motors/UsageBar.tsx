import type { JSX } from "react";
import type { IntervalCounter, UsageUnit } from "../../lib/motors/types.ts";
import Ring from "../ui/Ring.tsx";
import { formatUsage } from "./motors-api.ts";

const FILL: Record<string, string> = { fine: "bg-spruce", watch: "bg-brass", act: "bg-oxide" };

interface Props {
  label: string;
  counter: IntervalCounter;
  unit: UsageUnit;
  /** Smaller text for table cells. */
  compact?: boolean;
  testId?: string;
}

/**
 * Usage against its limit: a thin bar with the figures beside it. The ring repeats the level as a
 * shape and the words say it, so the colour is never the only cue.
 */
export default function UsageBar({ label, counter, unit, compact = false, testId }: Props): JSX.Element {
  const share = counter.share;
  const width = share === null ? 0 : Math.min(share, 1) * 100;
  const figures = counter.limit === null ? `${formatUsage(counter.used, unit)}, no limit` : `${formatUsage(counter.used, unit)} of ${formatUsage(counter.limit, unit)}`;
  return (
    <div className={compact ? "min-w-[8.5rem] text-sm" : "min-w-[10rem]"} data-testid={testId}>
      <div className="flex items-center justify-between gap-2">
        <span className={compact ? "sr-only" : "text-sm font-semibold text-pencil"}>{label}</span>
        <span className="rl-num flex items-center gap-1.5">
          {counter.level && counter.level !== "fine" ? <Ring level={counter.level} size={14} /> : null}
          <span>{figures}</span>
        </span>
      </div>
      {counter.limit !== null ? (
        <div
          className="mt-1 h-1.5 w-full overflow-hidden rounded-sm bg-rule/60"
          role="meter"
          aria-label={`${label}: ${figures}`}
          aria-valuemin={0}
          aria-valuemax={counter.limit}
          aria-valuenow={Math.min(counter.used, counter.limit)}
        >
          <div className={`h-full ${FILL[counter.level ?? "fine"]}`} style={{ width: `${width}%` }} />
        </div>
      ) : null}
      {counter.level === "act" ? <span className="text-xs font-semibold text-oxide">at or past the limit</span> : null}
    </div>
  );
}
