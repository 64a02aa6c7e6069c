/** Errors that carry their HTTP meaning; everything else becomes a plain 500 without details. */
export class HttpError extends Error {
  constructor(
    public readonly status: number,
    public readonly code: string,
    message: string,
    public readonly fields?: Record<string, string>,
    public readonly headers?: Record<string, string>,
  ) {
    super(message);
    this.name = "HttpError";
  }
}

export const unauthorized = (message = "Sign in to continue."): HttpError => new HttpError(401, "unauthorized", message);
export const forbidden = (message = "Your role in this organisation may not do that."): HttpError =>
  new HttpError(403, "forbidden", message);
export const notFound = (message = "Not found."): HttpError => new HttpError(404, "not_found", message);
export const badRequest = (message: string, fields?: Record<string, string>): HttpError =>
  new HttpError(400, "invalid_input", message, fields);
export const conflict = (message: string, fields?: Record<string, string>): HttpError =>
  new HttpError(409, "conflict", message, fields);
