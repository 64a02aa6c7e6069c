import { notFound } from "./errors.ts";

/** A numeric id from the URL; anything else answers 404, as an unknown id does. */
export function idParam(params: Record<string, string | undefined>, name = "id", message = "Not found."): number {
  const raw = params[name] ?? "";
  if (!/^[1-9]\d{0,14}$/.test(raw)) throw notFound(message);
  return Number(raw);
}
