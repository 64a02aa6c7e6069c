import { useState, type JSX } from "react";
import { requestJson } from "./motors-api.ts";

/** A crew chief picks another set as the engine's baseline; the page reloads so charts redraw. */
export default function BaselineButton({ readingSetId }: { readingSetId: number }): JSX.Element {
  const [state, setState] = useState<"idle" | "saving" | "error">("idle");
  const [message, setMessage] = useState("");
  async function mark(): Promise<void> {
    setState("saving");
    try {
      await requestJson("POST", `/api/v1/reading-sets/${readingSetId}/baseline`, { isBaseline: true });
      window.location.reload();
    } catch (err) {
      setState("error");
      setMessage((err as Error).message);
    }
  }
  return (
    <p className="flex flex-wrap items-center gap-3 text-sm">
      <button type="button" className="rl-button-quiet !min-h-0 !py-1.5" disabled={state === "saving"} onClick={() => void mark()}>
        {state === "saving" ? "Marking…" : "Mark as baseline"}
      </button>
      {state === "error" ? <span className="rl-error" role="alert">{message}</span> : null}
    </p>
  );
}
