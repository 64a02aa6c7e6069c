import { useEffect, useMemo, useRef, useState, type JSX } from "react";
import type { FuelTable } from "../lib/domain/fuel.ts";
import type { UnitChoice } from "../lib/domain/units.ts";
import CompressionFigures from "./workbench/CompressionFigures.tsx";
import { computeWorkbench } from "./workbench/compute-workbench.ts";
import EngineSection from "./workbench/EngineSection.tsx";
import FuelSection from "./workbench/FuelSection.tsx";
import LiveStrip from "./workbench/LiveStrip.tsx";
import PlanSection from "./workbench/PlanSection.tsx";
import type { SectionProps } from "./workbench/section-props.ts";
import UnitBar from "./workbench/UnitBar.tsx";
import {
  changeUnits,
  formatForUnits,
  parseQuery,
  serializeState,
  type TextField,
  type WorkbenchState,
} from "./workbench/workbench-state.ts";

interface Props {
  /** The page's query string, so the server's first render and the browser's agree. */
  initialSearch: string;
  /** The person's saved units (their own choices, else their system, else the organisation's). */
  savedUnits: UnitChoice;
  /** The organisation's shop elevation, the fuel check's starting elevation; null when not set. */
  shopElevationM: number | null;
  /** The organisation's own fuel table; null while it runs on the seed defaults. */
  fuelTable: FuelTable | null;
}

interface Start {
  state: WorkbenchState;
  shopElevationText: string | null;
}

function createStart({ initialSearch, savedUnits, shopElevationM }: Props): Start {
  const { state, hasValues } = parseQuery(initialSearch, savedUnits);
  if (hasValues || shopElevationM === null) return { state, shopElevationText: null };
  const text = formatForUnits("elevation", shopElevationM, state.units);
  return { state: { ...state, elevation: text }, shopElevationText: text };
}

async function saveUnits(units: UnitChoice, system: "metric" | "imperial" | null): Promise<boolean> {
  const body = system ? { unitSystem: system, unitChoices: null } : { unitChoices: units };
  try {
    const res = await fetch("/api/v1/me/preferences", {
      method: "PATCH",
      headers: { "content-type": "application/json" },
      body: JSON.stringify(body),
    });
    return res.ok;
  } catch {
    return false;
  }
}

/**
 * The compression workbench: measurements in, figures out as they are typed, computed in the
 * browser with the pure domain module. The state lives in the address bar (replaceState), so
 * a result can be shared, reloaded or printed.
 */
export default function Workbench(props: Props): JSX.Element {
  const [start] = useState(() => createStart(props));
  const [state, setState] = useState<WorkbenchState>(start.state);
  const [unitStatus, setUnitStatus] = useState("");
  const figures = useMemo(() => computeWorkbench(state, props.fuelTable), [state, props.fuelTable]);
  const saving = useRef(0);
  // The server cannot know the address the page was opened at; the printed copy shows it in full.
  const [origin, setOrigin] = useState("");
  useEffect(() => setOrigin(window.location.origin), []);

  useEffect(() => {
    const search = `?${serializeState(state)}`;
    if (window.location.search !== search) {
      window.history.replaceState(window.history.state, "", `${window.location.pathname}${search}`);
    }
  }, [state]);

  const setField = (field: TextField, value: string): void => setState((s) => ({ ...s, [field]: value }));
  const update = (patch: Partial<WorkbenchState>): void => setState((s) => ({ ...s, ...patch }));

  function changeUnitChoice(units: UnitChoice, system: "metric" | "imperial" | null): void {
    setState((s) => changeUnits(s, units));
    const ticket = ++saving.current;
    setUnitStatus("Saving your units…");
    void saveUnits(units, system).then((ok) => {
      if (ticket !== saving.current) return;
      setUnitStatus(ok ? "Saved: these units open next time." : "Not saved: these units apply on this page only.");
    });
  }

  const sectionProps: SectionProps = { state, figures, setField, update };
  const elevationHint =
    start.shopElevationText !== null && state.elevation === start.shopElevationText && state.units.elevation === start.state.units.elevation
      ? "Your shop's elevation, from the organisation's settings. Change it to the event's."
      : undefined;

  return (
    <div className="space-y-8" data-testid="workbench">
      <p className="hidden break-all text-sm print:block" data-testid="print-address">
        Printed from Ringland's Workbench: {origin}/workbench?{serializeState(state)}
      </p>
      <UnitBar units={state.units} onChange={changeUnitChoice} status={unitStatus} />
      <LiveStrip figures={figures} units={state.units} />
      <div className="grid gap-8 lg:grid-cols-2">
        <EngineSection {...sectionProps} />
        <CompressionFigures state={state} figures={figures} />
      </div>
      <div className="border-t-hair border-rule pt-6">
        <PlanSection {...sectionProps} />
      </div>
      <div className="border-t-hair border-rule pt-6">
        <FuelSection {...sectionProps} elevationHint={elevationHint} fuelTable={props.fuelTable} />
      </div>
    </div>
  );
}
