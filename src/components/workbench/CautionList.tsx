import type { JSX } from "react";

interface Props {
  title: string;
  cautions: readonly string[];
  testId?: string;
  /** "caution" for results, "notice" for the measuring reminders. */
  tone?: "caution" | "notice";
}

/** The plain-language cautions the product shows beside every fuel, compression and machining result. */
export default function CautionList({ title, cautions, testId, tone = "caution" }: Props): JSX.Element {
  return (
    <aside className={`${tone === "caution" ? "rl-caution" : "rl-notice text-sm"} break-inside-avoid`} data-testid={testId}>
      <p className="mb-1 font-semibold">{title}</p>
      <ul className="list-disc space-y-1 pl-5">
        {cautions.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
    </aside>
  );
}
