import type { WorkbenchFigures } from "./compute-workbench.ts";
import type { TextField, WorkbenchState } from "./workbench-state.ts";

/** What every Workbench section receives from the island. */
export interface SectionProps {
  state: WorkbenchState;
  figures: WorkbenchFigures;
  setField: (field: TextField, value: string) => void;
  update: (patch: Partial<WorkbenchState>) => void;
}
