import type { JSX } from "react";
import { Area, CartesianGrid, ComposedChart, Line, Tooltip, XAxis, YAxis } from "recharts";
import type { ChartBlock, ChartPoint } from "./chart-series.ts";
import { formatDate } from "./motors-api.ts";

// Drift over time, one small chart per quantity and cylinder: the readings as a line, the
// baseline in force as a dashed step, the watch band around it as a shaded strip. A reading
// outside the band is drawn as a hollow ring, so the warning does not rest on colour alone.

const AXIS_TICK = { fill: "currentColor", fontSize: 12 };

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

function toDayLabel(day: number): string {
  return formatDate(new Date(day * 86_400_000).toISOString().slice(0, 10));
}

/** Axis ticks: the month and the season's year, "Nov ’25". */
function toTick(day: number): string {
  const d = new Date(day * 86_400_000);
  return `${MONTHS[d.getUTCMonth()]} ’${String(d.getUTCFullYear()).slice(2)}`;
}

function ReadingDot(props: { cx?: number; cy?: number; payload?: ChartPoint; index?: number }): JSX.Element {
  const { cx, cy, payload, index } = props;
  if (cx === undefined || cy === undefined || !payload) return <g key={index} />;
  return payload.outside ? (
    <circle key={index} cx={cx} cy={cy} r={4.5} fill="rgb(var(--rl-paper))" stroke="rgb(var(--rl-oxide))" strokeWidth={2.5} data-outside="true" />
  ) : (
    <circle key={index} cx={cx} cy={cy} r={3.5} fill="currentColor" stroke="none" />
  );
}

interface Axis {
  domain: [number, number];
  ticks: number[];
  decimals: number;
}

/** A vertical axis on round steps (1, 2, 2.5 or 5 of a power of ten) around every value and band. */
function buildAxis(points: ChartPoint[]): Axis {
  const values = points.flatMap((p) => [p.value, p.baseline, ...(p.band ?? [])]).filter((v): v is number => v !== null);
  let lo = Math.min(...values);
  let hi = Math.max(...values);
  if (hi - lo < 1e-9) {
    const pad = Math.max(Math.abs(hi) * 0.01, 0.01);
    lo -= pad;
    hi += pad;
  }
  const raw = (hi - lo) / 4;
  const power = Math.floor(Math.log10(raw));
  const mag = 10 ** power;
  const factor = [1, 2, 2.5, 5, 10].find((m) => m * mag >= raw) ?? 10;
  const step = factor * mag;
  const decimals = Math.max(0, -power + (factor === 2.5 ? 1 : 0) - (factor === 10 ? 1 : 0));
  const start = Math.floor(lo / step - 1e-9) * step;
  const end = Math.ceil(hi / step + 1e-9) * step;
  const ticks: number[] = [];
  for (let t = start; t <= end + step / 2; t += step) ticks.push(Number(t.toFixed(decimals + 2)));
  return { domain: [ticks[0], ticks[ticks.length - 1]], ticks, decimals };
}

function CylinderChart({ block, cylinderNo, points }: { block: ChartBlock; cylinderNo: number; points: ChartPoint[] }): JSX.Element {
  const axis = buildAxis(points);
  const last = points[points.length - 1];
  const label = `${block.title}, cylinder ${cylinderNo}: ${points.length} reading${points.length === 1 ? "" : "s"}, latest ${last.value?.toFixed(block.decimals)} ${block.unitLabel}${last.baseline !== null ? ` against a baseline of ${last.baseline.toFixed(block.decimals)} ${block.unitLabel}` : ""}.`;
  return (
    <figure className="min-w-0" data-testid={`chart-${block.metric}-${cylinderNo}`}>
      <figcaption className="text-sm font-semibold">Cylinder {cylinderNo}</figcaption>
      <div className="text-ink" role="img" aria-label={label}>
        <ComposedChart responsive style={{ width: "100%", height: 180 }} data={points} margin={{ top: 8, right: 8, bottom: 0, left: 0 }}>
          <CartesianGrid stroke="rgb(var(--rl-rule))" strokeDasharray="2 4" vertical={false} />
          <XAxis dataKey="day" type="number" scale="time" domain={["dataMin", "dataMax"]} tickFormatter={toTick} tick={AXIS_TICK} stroke="rgb(var(--rl-rule))" minTickGap={24} padding={{ left: 10, right: 10 }} />
          <YAxis domain={axis.domain} ticks={axis.ticks} interval={0} tickFormatter={(v: number) => v.toFixed(axis.decimals)} tick={AXIS_TICK} stroke="rgb(var(--rl-rule))" width={52} allowDataOverflow />
          <Area className="rl-band text-spruce" dataKey="band" type="stepAfter" fill="currentColor" fillOpacity={0.14} stroke="none" isAnimationActive={false} connectNulls name="watch band" />
          <Line className="rl-baseline" dataKey="baseline" type="stepAfter" stroke="currentColor" strokeWidth={1.5} strokeDasharray="6 4" dot={false} isAnimationActive={false} connectNulls name="baseline" />
          <Line className="rl-reading" dataKey="value" type="linear" stroke="currentColor" strokeWidth={2} dot={ReadingDot} activeDot={{ r: 5 }} isAnimationActive={false} connectNulls name="reading" />
          <Tooltip
            isAnimationActive={false}
            labelFormatter={(day) => toDayLabel(Number(day))}
            formatter={(value, name) => {
              const v = Array.isArray(value) ? value.map((x) => Number(x).toFixed(block.decimals)).join(" to ") : Number(value).toFixed(block.decimals);
              return [`${v} ${block.unitLabel}`, String(name)];
            }}
            contentStyle={{ background: "rgb(var(--rl-sheet))", border: "1px solid rgb(var(--rl-rule))", borderRadius: 2, color: "rgb(var(--rl-ink))" }}
          />
        </ComposedChart>
      </div>
    </figure>
  );
}

interface Props {
  blocks: ChartBlock[];
}

export default function EngineCharts({ blocks }: Props): JSX.Element {
  if (blocks.length === 0) return <p className="text-pencil">No readings yet: the charts start with the first reading set.</p>;
  return (
    <div className="space-y-6" data-testid="engine-charts">
      <p className="flex flex-wrap items-center gap-x-5 gap-y-1 text-sm text-pencil">
        <span className="inline-flex items-center gap-2"><svg width="28" height="8" aria-hidden="true"><line x1="0" y1="4" x2="28" y2="4" stroke="currentColor" strokeWidth="2" /></svg>reading</span>
        <span className="inline-flex items-center gap-2"><svg width="28" height="8" aria-hidden="true"><line x1="0" y1="4" x2="28" y2="4" stroke="currentColor" strokeWidth="1.5" strokeDasharray="6 4" /></svg>baseline in force</span>
        <span className="inline-flex items-center gap-2"><span className="inline-block h-3 w-7 bg-spruce/20" aria-hidden="true" />watch band</span>
        <span className="inline-flex items-center gap-2"><svg width="12" height="12" aria-hidden="true"><circle cx="6" cy="6" r="4" fill="none" stroke="rgb(var(--rl-oxide))" strokeWidth="2.5" /></svg>outside the band</span>
      </p>
      {blocks.map((b) => (
        <section key={b.metric} aria-label={b.title} className="break-inside-avoid">
          <h3 className="font-semibold">{b.title} <span className="font-normal text-pencil">({b.unitLabel})</span></h3>
          <p className="mb-2 text-sm text-pencil">{b.bandNote}</p>
          <div className="grid gap-4 sm:grid-cols-2 xl:grid-cols-3">
            {b.cylinders.map((c) => <CylinderChart key={c.cylinderNo} block={b} cylinderNo={c.cylinderNo} points={c.points} />)}
          </div>
        </section>
      ))}
    </div>
  );
}
