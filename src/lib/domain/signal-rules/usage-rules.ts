import { buildSignal, exceeds, formatPct, formatUsage, reaches } from "./format";
import type { PlannedEventUsage, Signal, UsageCounter } from "./types";

// Due soon / overdue: usage since the last renewal against the interval's planning point
// (limit × planning fraction) and its limit, now and after the next planned event.
// "Never start an event projected to pass the limit" (TRADE.md) makes that projection an act.

function expectedUsage(counter: UsageCounter, nextEvent: PlannedEventUsage | null | undefined): number | undefined {
  if (!nextEvent) return undefined;
  if (counter.unit === "h") return nextEvent.expectedHours ?? nextEvent.expectedUsage;
  if (counter.unit === "L") return nextEvent.expectedLitres ?? nextEvent.expectedUsage;
  return nextEvent.expectedUsage;
}

function describeCounter(engineName: string, counter: UsageCounter): string {
  const owner = counter.scope === "part" ? `${engineName}, ${counter.label}` : `${engineName} ${counter.label}`;
  return `${owner}: ${formatUsage(counter.used, counter.unit)} used of its ${formatUsage(counter.limit, counter.unit)} interval`;
}

export function evaluateUsage(
  engineId: string,
  engineName: string,
  counters: UsageCounter[],
  planningFraction: number,
  nextEvent: PlannedEventUsage | null | undefined,
): Signal[] {
  const signals: Signal[] = [];
  for (const counter of counters) {
    const planningPoint = counter.limit * planningFraction;
    const usedPct = (counter.used / counter.limit) * 100;
    const expected = expectedUsage(counter, nextEvent);
    const projected = expected === undefined ? undefined : counter.used + expected;
    const numbers: Record<string, number> = {
      used: counter.used,
      limit: counter.limit,
      planningPoint,
      usedPct,
      ...(expected === undefined ? {} : { expectedNextEvent: expected, projectedAfterNextEvent: projected as number }),
    };
    const base = { engineId, metric: counter.id, numbers };
    const planText = `planning point of ${formatUsage(planningPoint, counter.unit)} (${formatPct(planningFraction * 100, 0)})`;
    const head = describeCounter(engineName, counter);

    if (reaches(counter.used, counter.limit)) {
      signals.push(
        buildSignal({
          ...base,
          kind: "overdue",
          severity: "act",
          message: `${head} (${formatPct(usedPct, 0)}): overdue.`,
        }),
      );
      continue;
    }
    // Ending an event exactly on the limit does not pass it.
    if (projected !== undefined && exceeds(projected, counter.limit) && nextEvent) {
      signals.push(
        buildSignal({
          ...base,
          kind: "due-soon",
          severity: "act",
          message:
            `${head}; ${nextEvent.name} is expected to add ` +
            `${formatUsage(expected as number, counter.unit)}, reaching ${formatUsage(projected, counter.unit)}: ` +
            "past the limit. Renew it before that event.",
        }),
      );
      continue;
    }
    if (reaches(counter.used, planningPoint)) {
      signals.push(
        buildSignal({
          ...base,
          kind: "due-soon",
          severity: "watch",
          message: `${head} (${formatPct(usedPct, 0)}): past the ${planText}.`,
        }),
      );
      continue;
    }
    if (projected !== undefined && nextEvent && reaches(projected, planningPoint)) {
      signals.push(
        buildSignal({
          ...base,
          kind: "due-soon",
          severity: "watch",
          message:
            `${head}; ${nextEvent.name} is expected to add ` +
            `${formatUsage(expected as number, counter.unit)}, reaching ${formatUsage(projected, counter.unit)}: ` +
            `past the ${planText}.`,
        }),
      );
    }
  }
  return signals;
}
