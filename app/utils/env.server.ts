import path from "node:path";
import { z } from "zod";

/**
 * Environment of the web and worker processes, validated once at start-up: the process refuses to
 * start on a bad value rather than failing on the first request that needs it.
 */
const EnvSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("production"),
  HOST: z.string().default("127.0.0.1"),
  PORT: z.coerce.number().int().min(1).max(65535).default(3000),
  APP_ORIGIN: z.url().default("http://127.0.0.1:3000"),
  DATABASE_URL: z.string().min(1, "DATABASE_URL is required"),
  S3_ENDPOINT: z.url().optional(),
  S3_REGION: z.string().default("us-east-1"),
  S3_ACCESS_KEY_ID: z.string().default("S3RVER"),
  S3_SECRET_ACCESS_KEY: z.string().default("S3RVER"),
  S3_BUCKET_UPLOADS: z.string().default("spanwright-uploads"),
  S3_BUCKET_REPORTS: z.string().default("spanwright-reports"),
  /** Checkpoints of the audit trail; in a deployment, a bucket that refuses overwrite and deletion. */
  S3_BUCKET_AUDIT: z.string().default("spanwright-audit"),
  SMTP_URL: z.string().optional(),
  MAIL_FROM: z.string().default("Spanwright <no-reply@spanwright.invalid>"),
  MAIL_CAPTURE_DIR: z.string().optional(),
  OIDC_ISSUER: z.url().optional(),
  OIDC_CLIENT_ID: z.string().default("spanwright"),
  OIDC_CLIENT_SECRET: z.string().default("spanwright-local-secret"),
  OIDC_LABEL: z.string().default("Company sign-in"),
});

export type Env = z.infer<typeof EnvSchema>;

let cached: Env | undefined;

/** Forgets the validated environment so the next call re-reads it (tests that move a service). */
export function resetEnvCache(): void {
  cached = undefined;
}

/** The validated environment; throws with every bad variable named. */
export function env(): Env {
  if (cached) return cached;
  const parsed = EnvSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Bad environment:\n${lines.join("\n")}`);
  }
  const value = parsed.data;
  if (value.MAIL_CAPTURE_DIR) value.MAIL_CAPTURE_DIR = path.resolve(value.MAIL_CAPTURE_DIR);
  const origin = new URL(value.APP_ORIGIN);
  const loopback = ["127.0.0.1", "localhost", "[::1]"].includes(origin.hostname);
  if (origin.protocol !== "https:" && !loopback) {
    throw new Error("APP_ORIGIN must use https unless the app is served on loopback");
  }
  cached = value;
  return value;
}

/** Cookies are Secure whenever the app is served over HTTPS, i.e. everywhere but a loopback workstation. */
export function cookiesSecure(): boolean {
  return new URL(env().APP_ORIGIN).protocol === "https:";
}

/**
 * The development mailbox page exists only in local mode: mail goes to the local capture (start-up
 * sets MAIL_CAPTURE_DIR only when no real relay, SMTP_URL, was configured) and the app is served on
 * loopback, never at an address others reach.
 */
export function mailCaptureEnabled(): boolean {
  const e = env();
  const host = new URL(e.APP_ORIGIN).hostname;
  return Boolean(e.MAIL_CAPTURE_DIR) && ["127.0.0.1", "localhost", "[::1]"].includes(host);
}
