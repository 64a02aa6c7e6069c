import type { JSX } from "react";
import { MACHINING_CAUTIONS } from "../../lib/domain/cautions.ts";
import { formatQuantity, getUnitLabel } from "../../lib/domain/units.ts";
import BeforeAfter from "./BeforeAfter.tsx";
import CautionList from "./CautionList.tsx";
import NumberField from "./NumberField.tsx";
import type { SectionProps } from "./section-props.ts";
import TargetSection from "./TargetSection.tsx";
import { nextStepId, type PlanStep, type PlanStepKind } from "./workbench-state.ts";

const STEP_TEXT: Record<PlanStepKind, { add: string; label: string; hint: string }> = {
  cut: {
    add: "Cut head face",
    label: "Cut the head face by",
    hint: "Volume and squish fall; the port timing stays. Negative: a thicker head gasket.",
  },
  gasket: {
    add: "Base gasket",
    label: "Change the base gasket by",
    hint: "Thicker (+): volume and squish rise, and the port rises too: it opens earlier.",
  },
  bowl: { add: "Open bowl", label: "Open the bowl by", hint: "Volume rises; squish stays. Negative: a filled bowl or smaller insert." },
  keep: {
    add: "Cut and keep the ratio",
    label: "Cut the face, re-open the bowl to keep the ratio; cut",
    hint: "Tightens squish; the bowl takes back the volume the cut removed.",
  },
};

const STEP_KINDS: PlanStepKind[] = ["cut", "gasket", "bowl", "keep"];

/** A chain of machining and gasket steps, and the engine before and after them. */
export default function PlanSection(props: SectionProps): JSX.Element {
  const { state, figures, update } = props;
  const u = state.units;
  const plan = figures.plan;

  const changeStep = (id: number, value: string): void => update({ plan: state.plan.map((s) => (s.id === id ? { ...s, value } : s)) });
  const removeStep = (id: number): void => update({ plan: state.plan.filter((s) => s.id !== id) });
  const addStep = (kind: PlanStepKind): void => update({ plan: [...state.plan, { id: nextStepId(state.plan), kind, value: "" }] });

  const stepNote = (step: PlanStep): string | undefined => {
    const bowlCc = plan?.keepBowlCc[step.id];
    return step.kind === "keep" && bowlCc !== undefined ? `Re-open the bowl by ${formatQuantity("volume", bowlCc, u)}.` : undefined;
  };

  return (
    <section aria-labelledby="plan-h" className="space-y-5">
      <h2 id="plan-h">Plan a change</h2>
      {!figures.compression ? (
        <p className="text-pencil">The plan opens once the measurements give a compression ratio.</p>
      ) : (
        <div className="grid gap-8 lg:grid-cols-2">
          <div className="space-y-5">
            <TargetSection {...props} />
            <div className="space-y-3 border-t-hair border-rule pt-4">
              <h3 className="text-lg font-semibold">Steps, in order</h3>
              {state.plan.length === 0 ? <p className="text-pencil">No steps yet: add one below.</p> : null}
              <ol className="space-y-3" data-testid="plan-steps">
                {state.plan.map((step, i) => (
                  <li key={step.id} className="flex items-start gap-2">
                    <span className="rl-num mt-8 w-5 shrink-0 text-pencil">{i + 1}.</span>
                    <div className="min-w-0 flex-1">
                      <NumberField
                        id={`wb-step-${step.id}`}
                        label={STEP_TEXT[step.kind].label}
                        value={step.value}
                        onChange={(v) => changeStep(step.id, v)}
                        unit={getUnitLabel(step.kind === "bowl" ? "volume" : "length", u)}
                        signed={step.kind !== "keep"}
                        hint={stepNote(step) ?? STEP_TEXT[step.kind].hint}
                        error={plan?.stepErrors[step.id]}
                      />
                    </div>
                    <button
                      type="button"
                      className="rl-button-quiet mt-6 !px-3 print:hidden"
                      aria-label={`Remove step ${i + 1}`}
                      onClick={() => removeStep(step.id)}
                    >
                      ✕
                    </button>
                  </li>
                ))}
              </ol>
              <div className="flex flex-wrap gap-2 print:hidden">
                {STEP_KINDS.map((kind) => (
                  <button key={kind} type="button" className="rl-button-quiet !min-h-0 !px-3 !py-2 text-sm" onClick={() => addStep(kind)}>
                    + {STEP_TEXT[kind].add}
                  </button>
                ))}
              </div>
            </div>
          </div>
          <div className="space-y-5">
            {plan ? <BeforeAfter plan={plan} units={u} /> : null}
            <CautionList title="Before you cut" cautions={MACHINING_CAUTIONS} testId="machining-cautions" />
          </div>
        </div>
      )}
    </section>
  );
}
