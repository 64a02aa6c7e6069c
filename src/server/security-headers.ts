/**
 * Headers every response carries. Astro's island loader is an inline script, so scripts allow
 * 'self' and inline; nothing is loaded from another origin, and frames are denied.
 */
const CSP = [
  "default-src 'self'",
  "script-src 'self' 'unsafe-inline'",
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self' data:", // the calendar ships its small icon font inline
  "connect-src 'self'",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join("; ");

export function securityHeaders(isApi: boolean): Record<string, string> {
  return {
    "content-security-policy": isApi ? "default-src 'none'; frame-ancestors 'none'" : CSP,
    "x-frame-options": "DENY",
    "x-content-type-options": "nosniff",
    "referrer-policy": "same-origin",
    "permissions-policy": "camera=(self), geolocation=(), microphone=()",
  };
}
