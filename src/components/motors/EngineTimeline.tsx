import { useInfiniteQuery } from "@tanstack/react-query";
import { useEffect, useState, type JSX } from "react";
import type { TimelineItem, TimelineKind } from "../../lib/motors/types.ts";
import { formatDate, getJson, MOTORS_CHANGED_EVENT } from "./motors-api.ts";
import QueryRoot from "./QueryRoot.tsx";

// Everything that happened to one engine, newest first: installs and removals, usage, rebuilds,
// reading sets and part moves, a page at a time.

interface TimelinePage {
  items: TimelineItem[];
  page: number;
  limit: number;
  total: number;
}

interface Props {
  engineId: number;
  initialPage: TimelinePage;
}

const GROUPS: { key: string; label: string; kinds: TimelineKind[] }[] = [
  { key: "all", label: "everything", kinds: [] },
  { key: "usage", label: "usage", kinds: ["usage"] },
  { key: "work", label: "rebuilds and readings", kinds: ["service", "reading_set"] },
  { key: "chassis", label: "chassis", kinds: ["installed", "removed"] },
  { key: "parts", label: "parts", kinds: ["part_in", "part_out", "part_cut", "part_oversize"] },
];

const MARK: Record<TimelineKind, string> = {
  installed: "in",
  removed: "out",
  usage: "ran",
  service: "rebuild",
  reading_set: "readings",
  part_in: "part in",
  part_out: "part out",
  part_cut: "cut",
  part_oversize: "oversize",
};

function TimelineView({ engineId, initialPage }: Props): JSX.Element {
  const [group, setGroup] = useState("all");
  const query = useInfiniteQuery({
    queryKey: ["timeline", engineId],
    queryFn: ({ pageParam }) => getJson<TimelinePage>(`/api/v1/engines/${engineId}/timeline?page=${pageParam}&limit=${initialPage.limit}`),
    initialPageParam: 1,
    getNextPageParam: (last) => (last.page * last.limit < last.total ? last.page + 1 : undefined),
    initialData: { pages: [initialPage], pageParams: [1] },
  });
  const { refetch } = query;
  useEffect(() => {
    const refresh = (): void => void refetch();
    window.addEventListener(MOTORS_CHANGED_EVENT, refresh);
    return () => window.removeEventListener(MOTORS_CHANGED_EVENT, refresh);
  }, [refetch]);
  const kinds = GROUPS.find((g) => g.key === group)?.kinds ?? [];
  const items = (query.data?.pages ?? []).flatMap((p) => p.items).filter((i) => kinds.length === 0 || kinds.includes(i.kind));
  const total = query.data?.pages[0]?.total ?? 0;
  const loaded = (query.data?.pages ?? []).reduce((n, p) => n + p.items.length, 0);

  return (
    <div data-testid="engine-timeline">
      <div className="mb-3 flex flex-wrap items-end gap-3">
        <div>
          <label className="rl-label" htmlFor="timeline-group">Show</label>
          <select id="timeline-group" className="rl-field !w-auto" value={group} onChange={(e) => setGroup(e.target.value)}>
            {GROUPS.map((g) => <option key={g.key} value={g.key}>{g.label}</option>)}
          </select>
        </div>
        <p className="pb-2 text-sm text-pencil">{loaded} of {total} entries loaded</p>
      </div>
      {items.length === 0 ? <p className="border-y-hair border-rule py-4 text-pencil">Nothing of this kind yet.</p> : (
        <ol className="divide-y divide-rule border-y-hair border-rule">
          {items.map((i) => (
            <li key={`${i.kind}-${i.id}`} className="grid grid-cols-[6.5rem_5.5rem_1fr] gap-x-3 py-2 text-sm sm:grid-cols-[7.5rem_6rem_1fr]" data-kind={i.kind}>
              <time className="rl-num text-pencil" dateTime={i.on}>{formatDate(i.on)}</time>
              <span className="font-semibold uppercase tracking-wide text-pencil text-xs pt-0.5">{MARK[i.kind]}</span>
              <span className={i.kind === "service" || (i.kind === "reading_set" && i.details.isBaseline) ? "font-semibold" : ""}>
                {i.kind === "reading_set" ? <a href={`#set-${i.id}`}>{i.summary}</a> : i.summary}
              </span>
            </li>
          ))}
        </ol>
      )}
      {query.isError ? <p className="rl-caution mt-2" role="alert">Older entries could not be loaded: {(query.error as Error).message}</p> : null}
      {query.hasNextPage ? (
        <button type="button" className="rl-button-quiet mt-3" disabled={query.isFetchingNextPage} onClick={() => void query.fetchNextPage()}>
          {query.isFetchingNextPage ? "Loading…" : "Show older entries"}
        </button>
      ) : null}
    </div>
  );
}

export default function EngineTimeline(props: Props): JSX.Element {
  return (
    <QueryRoot>
      <TimelineView {...props} />
    </QueryRoot>
  );
}
