import type { JSX } from "react";
import { IMPERIAL_UNITS, METRIC_UNITS, type UnitChoice } from "../../lib/domain/units.ts";
import { UNIT_OPTIONS, UNIT_QUANTITIES, type UnitQuantity } from "../../lib/unit-preferences.ts";
import Choice from "./Choice.tsx";

const QUANTITY_LABEL: Record<UnitQuantity, string> = {
  length: "Lengths",
  volume: "Volumes",
  pressure: "Pressure",
  elevation: "Elevation",
  temperature: "Air temperature",
};

const UNIT_LABEL: Record<string, string> = {
  mm: "mm",
  in: "in",
  cc: "cc",
  in3: "in³",
  kPa: "kPa",
  bar: "bar",
  psi: "psi",
  m: "m",
  ft: "ft",
  C: "°C",
  F: "°F",
};

interface Props {
  units: UnitChoice;
  /** A single quantity changed, or a whole system was picked. */
  onChange: (units: UnitChoice, system: "metric" | "imperial" | null) => void;
  status: string;
}

export default function UnitBar({ units, onChange, status }: Props): JSX.Element {
  return (
    <section aria-labelledby="units-h" className="border-y-hair border-rule py-3 print:hidden">
      <div className="mb-2 flex flex-wrap items-center gap-x-3 gap-y-2">
        <h2 id="units-h" className="text-base font-semibold">
          Units
        </h2>
        <button
          type="button"
          className="rl-button-quiet !min-h-0 !px-3 !py-1.5 text-sm"
          onClick={() => onChange({ ...METRIC_UNITS }, "metric")}
        >
          All metric
        </button>
        <button
          type="button"
          className="rl-button-quiet !min-h-0 !px-3 !py-1.5 text-sm"
          onClick={() => onChange({ ...IMPERIAL_UNITS }, "imperial")}
        >
          All imperial
        </button>
        <p className="text-sm text-pencil" role="status" data-testid="unit-status">
          {status}
        </p>
      </div>
      <div className="flex flex-wrap gap-x-5 gap-y-3">
        {UNIT_QUANTITIES.map((q) => (
          <Choice
            key={q}
            name={`unit-${q}`}
            legend={QUANTITY_LABEL[q]}
            value={units[q]}
            options={(UNIT_OPTIONS[q] as readonly string[]).map((u) => ({ value: u, label: UNIT_LABEL[u] ?? u }))}
            onChange={(u) => onChange({ ...units, [q]: u }, null)}
          />
        ))}
      </div>
    </section>
  );
}
