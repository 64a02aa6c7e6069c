import { useEffect, useState, type JSX } from "react";
import { callApi } from "./api.ts";

// The person's own secret calendar link for a phone's calendar app: created here (shown once),
// replaced or revoked at any time.

interface FeedStatus {
  active: boolean;
  createdAt: string | null;
  url?: string;
}

export default function CalendarLink(): JSX.Element {
  const [feed, setFeed] = useState<FeedStatus | null>(null);
  const [error, setError] = useState("");
  useEffect(() => {
    void callApi<FeedStatus>("GET", "/api/v1/calendar-feed").then((a) => (a.ok ? setFeed(a.body) : setError(a.message)));
  }, []);
  async function change(method: "POST" | "DELETE"): Promise<void> {
    const a = await callApi<FeedStatus>(method, "/api/v1/calendar-feed");
    if (a.ok) {
      setFeed(a.body);
      setError("");
    } else setError(a.message);
  }
  return (
    <section className="mt-8 border-t-hair border-rule pt-4" aria-labelledby="feed-title">
      <h2 id="feed-title">The plan on your phone</h2>
      <p className="mt-1 text-sm text-pencil">A private calendar link with the events, bench jobs and projected due dates. Anyone with the link can read the plan: keep it to yourself, and revoke it if it leaks.</p>
      {feed?.url ? (
        <p className="mt-2 break-all"><span className="text-sm text-pencil">Your link (shown only now): </span><code className="rl-num" data-testid="feed-url">{feed.url}</code></p>
      ) : feed?.active ? (
        <p className="mt-2 text-sm">You have a live link since {feed.createdAt?.slice(0, 10)}. A new link replaces it.</p>
      ) : null}
      <div className="mt-2 flex flex-wrap gap-2">
        <button type="button" className="rl-button-quiet" onClick={() => void change("POST")}>{feed?.active ? "Make a new link" : "Make my calendar link"}</button>
        {feed?.active ? <button type="button" className="rl-button-quiet" onClick={() => void change("DELETE")}>Revoke my link</button> : null}
      </div>
      {error ? <p className="rl-error" role="alert">{error}</p> : null}
    </section>
  );
}
