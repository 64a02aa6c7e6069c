import { z } from "zod";

/**
 * Configuration, parsed once from process.env. Every server module, knexfile.ts, jobs/ and the
 * scripts read it from here; secrets never pass through import.meta.env (inlined at build time).
 */
const port = z.coerce.number().int().min(1).max(65535);

const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  HOST: z.string().default("127.0.0.1"),
  PORT: port.default(4321),
  APP_URL: z.url().optional(),
  DB_HOST: z.string().default("127.0.0.1"),
  DB_PORT: port.default(3407),
  DB_NAME: z.string().regex(/^[A-Za-z0-9_]+$/).default("ringland"),
  DB_USER: z.string().regex(/^[A-Za-z0-9_]+$/).default("ringland"),
  DB_PASSWORD: z.string().min(8).default("ringland-local-dev"),
  DB_POOL_MAX: z.coerce.number().int().min(1).max(100).default(10),
  SMTP_HOST: z.string().default("127.0.0.1"),
  SMTP_PORT: port.default(2525),
  SMTP_SECURE: z.enum(["true", "false"]).default("false").transform((v) => v === "true"),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().default("Ringland <signals@ringland.example>"),
  MAIL_INBOX_PORT: port.default(8025),
  S3_ENDPOINT: z.url().default("http://127.0.0.1:4569"),
  S3_REGION: z.string().default("us-east-1"),
  S3_BUCKET: z.string().default("ringland-uploads"),
  S3_ACCESS_KEY_ID: z.string().default("S3RVER"),
  S3_SECRET_ACCESS_KEY: z.string().default("S3RVER"),
  S3_FORCE_PATH_STYLE: z.enum(["true", "false"]).default("true").transform((v) => v === "true"),
  SECURE_COOKIES: z.enum(["auto", "true", "false"]).default("auto"),
  JOB_TIMEZONE_FALLBACK: z.string().default("UTC"),
});

export type Env = z.infer<typeof schema>;

function parseEnv(source: NodeJS.ProcessEnv): Env {
  const result = schema.safeParse(source);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Ringland configuration is invalid:\n${lines.join("\n")}`);
  }
  return result.data;
}

export const env: Env = parseEnv(process.env);

export function appUrl(): string {
  return env.APP_URL ?? `http://localhost:${env.PORT}`;
}

export function useSecureCookies(): boolean {
  if (env.SECURE_COOKIES === "auto") return env.NODE_ENV === "production" && appUrl().startsWith("https:");
  return env.SECURE_COOKIES === "true";
}
