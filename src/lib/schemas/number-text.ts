import { z } from "zod";

/** A decimal number written as text: an optional sign, digits, decimals and exponent; never "", hex or "NaN". */
export const NUMBER_TEXT = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

/**
 * A number typed as text (a query string, a multipart form field), checked by `target`. Text that
 * is not a finite decimal number is refused with `message`: never read as NaN, as 0 (" ") or as
 * 16 ("0x10") the way z.coerce.number() reads it, and no message ever says "received NaN".
 */
export function numberFromText(target: z.ZodNumber, message = "Enter a number."): z.ZodType<number, string> {
  return z
    .string({ error: message })
    .trim()
    .regex(NUMBER_TEXT, message)
    .transform(Number)
    .refine((n) => Number.isFinite(n), message)
    .pipe(target);
}
