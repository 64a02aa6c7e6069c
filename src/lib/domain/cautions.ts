// The plain-language cautions shown beside every fuel, compression and machining result and
// on every measuring procedure. The API returns them with fuel checks; the UI shows the same
// strings, so the wording lives in one place.

export const CAUTION_TRAINED_BUILDER =
  "These figures are guidance for a trained engine builder, not an instruction: check them against your own measurements before you act on them.";

export const CAUTION_DETONATION =
  "Detonation can hole a piston or break an engine within seconds, and parts leaving a failing engine can hurt people nearby.";

export const CAUTION_SPECIFICATIONS_FIRST =
  "The engine builder's sheet, the manufacturer's specifications and the event's sanctioning rules come before anything shown here.";

export const CAUTION_FUEL_FIRE_CODES =
  "Store, carry and mix fuel in approved containers and as your local fire codes require.";

export const CAUTION_FUEL_TABLE_IS_THE_TEAMS =
  "The fuel row comes from your team's fuel table: Ringland estimates cylinder pressure, it does not choose a fuel, and it never suggests raising compression.";

export const CAUTION_DEFAULT_FUEL_TABLE =
  "This check used Ringland's seed fuel table of common-practice defaults: have your engine builder review it and make it your team's own.";

export const CAUTION_ESTIMATE_SCATTER =
  "Cranking pressure is an estimate: gauges, hoses, cranking speed and temperature move real readings by several percent.";

export const CAUTION_COMPRESSION_HIGHER_NEEDS_FUEL =
  "More compression needs more octane and more care; a ratio worked out here is not a recommendation to raise it.";

export const CAUTION_MACHINING_BORE_AREA =
  "Cut volumes assume the removed face spans the whole bore; measure the chamber again after any machining.";

export const CAUTION_MACHINING_FINITE =
  "A head or insert can only be cut so far: keep a running total of material removed and stop at the builder's limit.";

export const CAUTION_MEASURE_NO_LIQUID_IN_CRANKCASE =
  "Seal the piston edge before filling the chamber, and keep the measuring liquid out of the crankcase.";

export const CAUTION_MEASURE_COLD_ENGINE_IGNITION_OFF =
  "Measure on a cold engine with the ignition disabled (plug cap off and grounded, kill switch on).";

export const CAUTION_MEASURE_HANDS_CLEAR =
  "Keep hands, tools and loose clothing clear of the chain, belt, clutch and flywheel while turning the engine over.";

export const FUEL_CAUTIONS: readonly string[] = Object.freeze([
  CAUTION_TRAINED_BUILDER,
  CAUTION_DETONATION,
  CAUTION_SPECIFICATIONS_FIRST,
  CAUTION_FUEL_TABLE_IS_THE_TEAMS,
  CAUTION_ESTIMATE_SCATTER,
  CAUTION_FUEL_FIRE_CODES,
]);

export const COMPRESSION_CAUTIONS: readonly string[] = Object.freeze([
  CAUTION_TRAINED_BUILDER,
  CAUTION_DETONATION,
  CAUTION_SPECIFICATIONS_FIRST,
  CAUTION_COMPRESSION_HIGHER_NEEDS_FUEL,
]);

export const MACHINING_CAUTIONS: readonly string[] = Object.freeze([
  CAUTION_TRAINED_BUILDER,
  CAUTION_DETONATION,
  CAUTION_SPECIFICATIONS_FIRST,
  CAUTION_MACHINING_BORE_AREA,
  CAUTION_MACHINING_FINITE,
]);

export const MEASURING_CAUTIONS: readonly string[] = Object.freeze([
  CAUTION_MEASURE_COLD_ENGINE_IGNITION_OFF,
  CAUTION_MEASURE_NO_LIQUID_IN_CRANKCASE,
  CAUTION_MEASURE_HANDS_CLEAR,
]);
