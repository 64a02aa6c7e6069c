import type { JSX, ReactNode } from "react";

interface Props {
  label: ReactNode;
  value: ReactNode;
  note?: ReactNode;
  testId?: string;
  strong?: boolean;
  /** Words rather than a number: the value gets its own line, read left to right. */
  wordy?: boolean;
}

/** One computed figure: a label, the value with its unit, and an optional line of explanation. */
export default function Figure({ label, value, note, testId, strong = false, wordy = false }: Props): JSX.Element {
  return (
    <div className="flex flex-wrap items-baseline justify-between gap-x-4 border-b-hair border-rule py-2 last:border-b-0">
      <dt className="text-pencil">{label}</dt>
      <dd
        className={`rl-num ${wordy ? "w-full text-left" : "text-right"} ${strong ? "text-2xl font-bold" : "text-lg font-semibold"}`}
        data-testid={testId}
      >
        {value}
      </dd>
      {note ? <dd className="w-full text-sm text-pencil">{note}</dd> : null}
    </div>
  );
}
