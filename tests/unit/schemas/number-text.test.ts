import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { NUMBER_TEXT, numberFromText } from "../../../src/lib/schemas/number-text.ts";
import { numberFromFormText, generalSettingsSchema } from "../../../src/lib/schemas/settings.ts";
import { switchOrgSchema } from "../../../src/lib/schemas/auth.ts";

const anyNumber = numberFromText(z.number(), "Enter a number.");

function messages(r: { success: boolean; error?: z.ZodError }): string[] {
  return r.error?.issues.map((i) => i.message) ?? [];
}

describe("numberFromText", () => {
  it("reads back every finite number written the way JavaScript writes it", () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (d) => {
        const r = anyNumber.safeParse(String(d));
        expect(r.success).toBe(true);
        expect(Object.is(r.data, d) || (d === 0 && r.data === 0)).toBe(true);
      }),
      { seed: 20261207 },
    );
  });

  it("refuses text that is no decimal number, by its own message and never as NaN", () => {
    // z.coerce.number() would read "0x10" as 16 and " " as 0, and answer "received NaN" for "abc".
    for (const text of ["", " ", "NaN", "Infinity", "-Infinity", "1e309", "0x10", "0b1", "１２", "1,5", "1 2", "abc", "--1", "1e", "."]) {
      const r = anyNumber.safeParse(text);
      expect(r.success, JSON.stringify(text)).toBe(false);
      expect(messages(r)).toEqual(["Enter a number."]);
    }
  });

  it("refuses anything that is not text", () => {
    for (const v of [5, true, null, [], {}]) expect(anyNumber.safeParse(v).success).toBe(false);
  });

  it("leaves the range to the target, and never lets NaN through it", () => {
    const cylinders = numberFromText(z.number().int().min(1).max(24), "Enter a cylinder from 1 to 24.");
    expect(cylinders.safeParse(" 4 ").data).toBe(4);
    expect(cylinders.safeParse("25").success).toBe(false);
    expect(cylinders.safeParse("1.5").success).toBe(false);
    fc.assert(
      fc.property(fc.string(), (s) => {
        const r = cylinders.safeParse(s);
        if (r.success) expect(Number.isInteger(r.data) && r.data >= 1 && r.data <= 24).toBe(true);
        else expect(messages(r).join(" ")).not.toMatch(/NaN|Infinity/);
      }),
      { seed: 20261207 },
    );
  });

  it("agrees with its pattern", () => {
    expect(NUMBER_TEXT.test("-.5e-3")).toBe(true);
    expect(NUMBER_TEXT.test("+12.")).toBe(true);
    expect(NUMBER_TEXT.test("12e+")).toBe(false);
  });
});

describe("JSON bodies take numbers as numbers", () => {
  it("the organisation switch refuses true, [7] and \"7\" for an id", () => {
    for (const v of [true, [7], "7", 7.5, 0, -1]) expect(switchOrgSchema.safeParse({ organisationId: v }).success, JSON.stringify(v)).toBe(false);
    expect(switchOrgSchema.safeParse({ organisationId: 7 }).success).toBe(true);
  });

  it("settings refuse true, [] and text for a number; the form turns its text into numbers first", () => {
    const general = generalSettingsSchema.partial();
    for (const v of [true, [], "366", ""]) expect(general.safeParse({ shopElevationM: v }).success, JSON.stringify(v)).toBe(false);
    expect(general.safeParse({ shopElevationM: null }).success).toBe(true);
    expect(general.safeParse({ shopElevationM: numberFromFormText(" 366 ") }).data?.shopElevationM).toBe(366);
    const typo = general.safeParse({ chamberToleranceCc: numberFromFormText("0,2") });
    expect(typo.success).toBe(false);
    expect(messages(typo)).toEqual(["Enter the tolerance in cc."]);
    expect(numberFromFormText(undefined)).toBeUndefined();
  });
});
