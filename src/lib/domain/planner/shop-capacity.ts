import { findWeekdayIndex } from "./day-math";
import type { NormInput } from "./normalize-input";

// Free shop labour per day, in centi-hours so that labour split over days adds up exactly.
// While jobs are booked days only fill up, which lets a prefix-sum tree answer "how much is
// free between two days" and a skip list jump over full days in O(log n) amortised.

export type DayBlock = "open" | "closed" | "event" | "travel" | "noHours" | "past";

export interface ShopDays {
  firstDay: number;
  lastDay: number;
  free: Int32Array;
  block: DayBlock[];
  /** The event that blocks a day, for messages. */
  blockingEvent: Map<number, string>;
  tree: Float64Array;
  /** Skip list over full days, forward: only valid while days only fill up. */
  nextOpen: Int32Array;
}

export interface DayLabour {
  day: number;
  centi: number;
}

export function buildShopDays(norm: NormInput): ShopDays {
  const firstDay = norm.todayDay;
  const lastDay = norm.horizonEndDay;
  const n = lastDay - firstDay + 1;
  const block: DayBlock[] = new Array<DayBlock>(n).fill("open");
  const blockingEvent = new Map<number, string>();
  for (const event of norm.events) {
    for (let d = event.startDay - norm.travelDays; d <= event.endDay; d++) {
      if (d < firstDay || d > lastDay) continue;
      const kind: DayBlock = d < event.startDay ? "travel" : "event";
      // An event day outranks a travel day for another event when they coincide.
      if (block[d - firstDay] !== "event") {
        block[d - firstDay] = kind;
        blockingEvent.set(d, event.name);
      }
    }
  }
  const free = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const day = firstDay + i;
    if (block[i] === "open" && norm.closedDays.has(day)) block[i] = "closed";
    if (block[i] === "open" && norm.shopCentiByWeekday[findWeekdayIndex(day)] === 0) block[i] = "noHours";
    if (block[i] === "open") free[i] = norm.shopCentiByWeekday[findWeekdayIndex(day)];
  }
  const tree = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) addToTree(tree, i, free[i]);
  const nextOpen = new Int32Array(n);
  for (let i = 0; i < n; i++) nextOpen[i] = i;
  return { firstDay, lastDay, free, block, blockingEvent, tree, nextOpen };
}

function addToTree(tree: Float64Array, index: number, delta: number): void {
  for (let i = index + 1; i < tree.length; i += i & -i) tree[i] += delta;
}

function sumTree(tree: Float64Array, index: number): number {
  let s = 0;
  for (let i = index + 1; i > 0; i -= i & -i) s += tree[i];
  return s;
}

export function describeDayBlock(shop: ShopDays, day: number): DayBlock {
  if (day < shop.firstDay) return "past";
  if (day > shop.lastDay) return "closed";
  return shop.block[day - shop.firstDay];
}

/** Labour (centi-hours) still free from `fromDay` to `toDay`, both included. */
export function sumFreeCenti(shop: ShopDays, fromDay: number, toDay: number): number {
  const lo = Math.max(fromDay, shop.firstDay) - shop.firstDay;
  const hi = Math.min(toDay, shop.lastDay) - shop.firstDay;
  if (hi < lo) return 0;
  return sumTree(shop.tree, hi) - (lo > 0 ? sumTree(shop.tree, lo - 1) : 0);
}

/** The earliest index ≥ i whose day still has free labour (n when none). */
function findOpenAtOrAfter(shop: ShopDays, i: number): number {
  const n = shop.free.length;
  let root = i;
  while (root < n && shop.free[root] === 0) root = shop.nextOpen[root] > root ? shop.nextOpen[root] : root + 1;
  // Path compression: every full day visited now points past itself, at the open day found.
  let walk = i;
  while (walk < root) {
    const step = shop.nextOpen[walk] > walk ? shop.nextOpen[walk] : walk + 1;
    shop.nextOpen[walk] = root;
    walk = step;
  }
  return root;
}

function book(shop: ShopDays, i: number, centi: number): void {
  shop.free[i] -= centi;
  addToTree(shop.tree, i, -centi);
}

/**
 * Books `centi` of labour as early as possible in [fromDay, toDay]. Jobs are booked event by
 * event, earliest deadline first, and taking the earliest free hours leaves the later hours to
 * engines that come off an event later: never worse for fitting every job. Returns null,
 * booking nothing, when the window does not hold enough free labour.
 */
export function bookEarliest(shop: ShopDays, fromDay: number, toDay: number, centi: number): DayLabour[] | null {
  if (sumFreeCenti(shop, fromDay, toDay) < centi) return null;
  const hi = Math.min(toDay, shop.lastDay) - shop.firstDay;
  const booked: DayLabour[] = [];
  let left = centi;
  let i = findOpenAtOrAfter(shop, Math.max(fromDay, shop.firstDay) - shop.firstDay);
  while (left > 0 && i <= hi) {
    const take = Math.min(left, shop.free[i]);
    book(shop, i, take);
    booked.push({ day: shop.firstDay + i, centi: take });
    left -= take;
    i = findOpenAtOrAfter(shop, i + 1);
  }
  return booked;
}

/**
 * Moves a booked job as late as its window allows: releases its labour, then books the latest
 * free hours in [fromDay, toDay]. It always succeeds (its own hours are free again), so a
 * schedule that fits still fits. Released days may reopen, so this walks day by day instead of
 * trusting the skip list, and must only run once all forward booking is done.
 */
export function shiftLatest(shop: ShopDays, booked: DayLabour[], fromDay: number, toDay: number): DayLabour[] {
  let left = 0;
  for (const b of booked) {
    book(shop, b.day - shop.firstDay, -b.centi);
    left += b.centi;
  }
  const lo = Math.max(fromDay, shop.firstDay) - shop.firstDay;
  const moved: DayLabour[] = [];
  for (let i = Math.min(toDay, shop.lastDay) - shop.firstDay; left > 0 && i >= lo; i--) {
    if (shop.free[i] <= 0) continue;
    const take = Math.min(left, shop.free[i]);
    book(shop, i, take);
    moved.push({ day: shop.firstDay + i, centi: take });
    left -= take;
  }
  if (left > 0) throw new RangeError("shiftLatest lost labour: the job's own days were not free");
  return moved.reverse();
}

/**
 * Books `centi` of labour from `fromDay` onward (a pinned job starts on its day). Returns null,
 * booking nothing, when the start day has no free labour or the horizon runs out.
 */
export function bookForward(shop: ShopDays, fromDay: number, centi: number): DayLabour[] | null {
  const start = fromDay - shop.firstDay;
  if (start < 0 || start >= shop.free.length || shop.free[start] === 0) return null;
  return bookEarliest(shop, fromDay, shop.lastDay, centi);
}
