import type { APIContext, APIRoute } from "astro";
import { z, type ZodType } from "zod";
import { DomainInputError } from "../lib/domain/errors.ts";
import type { Permission } from "../lib/permissions.ts";
import { isDatabaseUnavailable } from "../db/client.ts";
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
    return json(
      { error: { code: "unavailable", message: "The database cannot be reached right now. Nothing was saved; try again in a moment." } },
      503,
      { "retry-after": "5" },
    );
  }
  console.error("ringland: unexpected error", err);
  return json({ error: { code: "internal", message: "Something went wrong on our side. Nothing was saved." } }, 500);
}

const MAX_BODY_BYTES = 2 * 1024 * 1024;

async function readJson(request: Request): Promise<unknown> {
  const type = request.headers.get("content-type") ?? "";
  if (!/^application\/json\b/i.test(type)) {
    throw new HttpError(415, "unsupported_media_type", "Send the request body as application/json.");
  }
  const text = await request.text();
  if (text.length > MAX_BODY_BYTES) throw new HttpError(413, "too_large", "The request body is too large.");
  if (text.trim() === "") return {};
  try {
    return JSON.parse(text);
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
