import type { BenchJobKind, ChecklistItem } from "./types.ts";

// The default checklist each new bench job starts with (common practice for a two-stroke race
// engine, written in Ringland's own words). A mechanic can tick, add or reword items per job;
// the engine builder's own procedure always comes first.

export const DEFAULT_CHECKLISTS: Readonly<Record<BenchJobKind, readonly string[]>> = Object.freeze({
  top_end: Object.freeze([
    "Cold engine, ignition disabled; plug caps off and grounded",
    "Teardown readings recorded: squish both sides of the pin axis, chamber volume by burette",
    "Head, cylinder and piston off; crown and squish band carbon noted",
    "Bore measured top, middle and bottom; taper and out-of-round written down",
    "Old piston measured; wear against the new one written down",
    "New piston and rings fitted, ring gaps checked in the bore",
    "New wrist pin, clips and small-end bearing",
    "Ports deburred and checked for cracks or nicks",
    "New base and head gaskets, thickness noted",
    "Head nuts torqued in order to the builder's figure",
    "Squish checked with solder on both sides of the pin axis",
    "Chamber volume by burette per cylinder (repeat until two agree); no liquid into the crankcase",
    "Leak-down or cranking compression per cylinder",
    "Break-in run done; new baseline reading set taken",
  ]),
  bottom_end: Object.freeze([
    "Cold engine, ignition disabled; engine out of the chassis",
    "Teardown readings recorded before opening the cases",
    "Crank runout and rod big-end side play measured before splitting",
    "Cases split; main bearings, seals and crank condition noted",
    "Crank rebuilt or replaced; trued and runout written down",
    "New main bearings and crank seals",
    "Cases cleaned, sealed and closed; crank spins free",
    "Full top end done as on the top-end list (piston, rings, pin, small-end bearing, gaskets)",
    "Head nuts torqued in order to the builder's figure",
    "Squish checked with solder on both sides of the pin axis",
    "Chamber volume by burette per cylinder (repeat until two agree); no liquid into the crankcase",
    "Crankcase pressure and vacuum test passed",
    "Engine back in; break-in run done; new baseline reading set taken",
  ]),
  inspection: Object.freeze([
    "Cold engine, ignition disabled; plug caps off and grounded",
    "Plugs read and gapped; colour written down per cylinder",
    "Cranking compression per cylinder, elevation and air temperature noted",
    "Leak-down per cylinder; where the air escapes written down",
    "Squish checked with solder on both sides of the pin axis",
    "Reeds, exhaust seals and coolant checked",
    "Findings written in the job notes",
  ]),
});

export function createDefaultChecklist(kind: BenchJobKind): ChecklistItem[] {
  return DEFAULT_CHECKLISTS[kind].map((item) => ({ item, done: false }));
}
