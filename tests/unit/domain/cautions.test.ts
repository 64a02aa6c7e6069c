import { describe, it, expect } from "vitest";
import {
  COMPRESSION_CAUTIONS,
  FUEL_CAUTIONS,
  MACHINING_CAUTIONS,
  MEASURING_CAUTIONS,
} from "../../../src/lib/domain/cautions";

// PRODUCT.md, "Cautions the product shows": each group must carry these points.
function mentions(group: readonly string[], pattern: RegExp): boolean {
  return group.some((text) => pattern.test(text));
}

describe("cautions", () => {
  it("say the results are guidance for a trained builder, that detonation destroys engines and hurts people, and that specs and rules come first", () => {
    for (const group of [FUEL_CAUTIONS, COMPRESSION_CAUTIONS, MACHINING_CAUTIONS]) {
      expect(mentions(group, /trained engine builder/i)).toBe(true);
      expect(mentions(group, /detonation/i)).toBe(true);
      expect(mentions(group, /hurt|injur/i)).toBe(true);
      expect(mentions(group, /manufacturer/i)).toBe(true);
      expect(mentions(group, /sanctioning rules/i)).toBe(true);
    }
  });

  it("send fuel handling to the local fire codes", () => {
    expect(mentions(FUEL_CAUTIONS, /fire codes/i)).toBe(true);
  });

  it("remind the mechanic how to measure safely", () => {
    expect(mentions(MEASURING_CAUTIONS, /crankcase/i)).toBe(true);
    expect(mentions(MEASURING_CAUTIONS, /cold engine/i)).toBe(true);
    expect(mentions(MEASURING_CAUTIONS, /ignition disabled/i)).toBe(true);
    expect(mentions(MEASURING_CAUTIONS, /hands/i)).toBe(true);
  });

  it("are distinct, non-empty and frozen", () => {
    for (const group of [FUEL_CAUTIONS, COMPRESSION_CAUTIONS, MACHINING_CAUTIONS, MEASURING_CAUTIONS]) {
      expect(Object.isFrozen(group)).toBe(true);
      expect(new Set(group).size).toBe(group.length);
      group.forEach((text) => expect(text.trim().length).toBeGreaterThan(20));
    }
  });
});
