import type { APIContext, APIRoute } from "astro";
import { z, type ZodType } from "zod";
import { DomainInputError } from "../lib/domain/errors.ts";
import type { Permission } from "../lib/permissions.ts";
import { isCommitOutcomeUnknown, isDatabaseUnavailable } from "../db/client.ts";
import { HttpError, badRequest } from "./errors.ts";
import { requirePermission, requireUser, type ActiveMembership } from "./auth/guard.ts";

export interface ErrorBody {
  error: { code: string; message: string; fields?: Record<string, string> };
}

export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), {
    status,
    headers: { "content-type": "application/json; charset=utf-8", "cache-control": "no-store", ...headers },
  });
}

/** Turns zod issues into { field: message }, one per field, with dotted paths. */
export function fieldsFromZod(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "body";
    fields[key] ??= issue.message;
  }
  return fields;
}

export function errorResponse(err: unknown): Response {
  if (err instanceof HttpError) {
    const body: ErrorBody = { error: { code: err.code, message: err.message } };
    if (err.fields) body.error.fields = err.fields;
    return json(body, err.status, err.headers);
  }
  if (err instanceof DomainInputError) {
    return json({ error: { code: "invalid_input", message: err.message, fields: { [err.field]: err.message } } }, 400);
  }
  if (err instanceof z.ZodError) {
    return json({ error: { code: "invalid_input", message: "Some fields are not valid.", fields: fieldsFromZod(err) } }, 400);
  }
  if (isDatabaseUnavailable(err)) {
    const message = isCommitOutcomeUnknown(err)
      ? "The database went away while saving: the change may or may not have been saved. Look before entering it again."
      : "The database cannot be reached right now. Nothing was saved; try again in a moment.";
    return json({ error: { code: "unavailable", message } }, 503, { "retry-after": "5" });
  }
  console.error("ringland: unexpected error", err);
  return json({ error: { code: "internal", message: "Something went wrong on our side. Nothing was saved." } }, 500);
}

export const MAX_BODY_BYTES = 2 * 1024 * 1024;
/**
 * A body over the limit is still read to its end, up to this much, and thrown away: the client
 * then gets its 413 on a connection it can keep using. Past it, reading stops at once; a client
 * still sending that much will not reuse the connection anyway.
 */
const DRAIN_BYTES_MAX = 4 * MAX_BODY_BYTES;

const tooLarge = (): HttpError => new HttpError(413, "too_large", "The request body is too large (at most 2 MB).");

/**
 * The body's bytes, refused (`tooLarge`) once they pass `maxBytes`, whatever Content-Length
 * claimed; nothing over the limit is held in memory. Up to `drainBytes` an over-long body is
 * still read to its end and thrown away, so the client gets its answer on a connection it can
 * keep using; past that, reading stops at once.
 */
export async function readBoundedBody(
  request: Request,
  opts: { maxBytes: number; drainBytes?: number; tooLarge: () => HttpError },
): Promise<Uint8Array<ArrayBuffer>> {
  const drainBytes = Math.max(opts.drainBytes ?? opts.maxBytes, opts.maxBytes);
  const declared = Number(request.headers.get("content-length"));
  if (Number.isFinite(declared) && declared > drainBytes) throw opts.tooLarge();
  if (!request.body) return new Uint8Array(new ArrayBuffer(0));
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > drainBytes) {
      await reader.cancel().catch(() => undefined);
      throw opts.tooLarge();
    }
    if (total <= opts.maxBytes) chunks.push(value);
  }
  if (total > opts.maxBytes) throw opts.tooLarge();
  const out = new Uint8Array(new ArrayBuffer(total));
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/** The body as UTF-8 text (as Request.text() would: a leading byte-order mark dropped). */
async function readBoundedText(request: Request, maxBytes: number): Promise<string> {
  return new TextDecoder().decode(await readBoundedBody(request, { maxBytes, drainBytes: DRAIN_BYTES_MAX, tooLarge }));
}

async function readJson(request: Request): Promise<unknown> {
  const type = request.headers.get("content-type") ?? "";
  // application/json with or without parameters; not application/json-seq, not text/plain.
  if (!/^application\/json\s*(;|$)/i.test(type)) {
    throw new HttpError(415, "unsupported_media_type", "Send the request body as application/json.");
  }
  const text = await readBoundedText(request, MAX_BODY_BYTES);
  if (text.trim() === "") return {};
  try {
    // A lone surrogate ("\ud800") is valid JSON but no text: it cannot be stored as UTF-8 nor in a
    // JSON column, so it becomes U+FFFD here, once, for every route.
    return JSON.parse(text, (_key, value: unknown) => (typeof value === "string" ? value.toWellFormed() : value));
  } catch {
    throw badRequest("The request body is not valid JSON.", { body: "not valid JSON" });
  }
}

function queryObject(url: URL): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of url.searchParams) out[k] = v;
  return out;
}

export interface HandlerArgs<I> {
  input: I;
  context: APIContext;
  /** The active membership; null only on routes with permission "public". */
  membership: ActiveMembership;
  /** The signed-in user; "" only on routes with permission "public". */
  userId: string;
}

interface ApiOptions<S extends ZodType | undefined> {
  input?: S;
  /** A permission from the table; "signed-in": any signed-in user; "public": no session needed. */
  permission: Permission | "signed-in" | "public";
  handler: (args: HandlerArgs<S extends ZodType ? z.infer<S> : undefined>) => Promise<Response | unknown>;
}

/**
 * Every API route goes through here: signed-in check, permission check, JSON content type for
 * bodies, zod parsing (400 naming each bad field), and one error shape out.
 */
export function defineApi<S extends ZodType | undefined>(opts: ApiOptions<S>): APIRoute {
  return async (context) => {
    try {
      const isPublic = opts.permission === "public";
      const user = isPublic ? context.locals.user : requireUser(context.locals);
      const membership =
        opts.permission === "public" || opts.permission === "signed-in"
          ? (context.locals.membership as ActiveMembership)
          : requirePermission(context.locals, opts.permission);
      let input: unknown = undefined;
      if (opts.input) {
        const raw = ["GET", "HEAD", "DELETE"].includes(context.request.method)
          ? queryObject(context.url)
          : await readJson(context.request);
        const parsed = opts.input.safeParse(raw);
        if (!parsed.success) {
          throw badRequest("Some fields are not valid.", fieldsFromZod(parsed.error));
        }
        input = parsed.data;
      }
      const result = await opts.handler({
        input: input as S extends ZodType ? z.infer<S> : undefined,
        context,
        membership,
        userId: user?.id ?? "",
      });
      return result instanceof Response ? result : json(result);
    } catch (err) {
      return errorResponse(err);
    }
  };
}
