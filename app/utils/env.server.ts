import { z } from "zod";

// Validated once at boot; every server module reads configuration from here.
const envSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  PORT: z.coerce.number().int().min(1).max(65535).default(3000),
  // Where mailed links point. Never taken from a request's Host header (anyone can send one).
  APP_URL: z.url({ protocol: /^https?$/, error: "APP_URL must be an http(s) URL" }).optional(),
  DB_HOST: z.string().default("127.0.0.1"),
  DB_PORT: z.coerce.number().int().min(1).max(65535).default(3307),
  DB_NAME: z.string().min(1).default("duskline"),
  DB_USER: z.string().min(1).default("duskline"),
  DB_PASSWORD: z.string().default("duskline-local"),
  SESSION_SECRET: z.string().min(16, "SESSION_SECRET must be at least 16 characters").default("dev-only-session-secret-change-me"),
  SMTP_HOST: z.string().default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  MAIL_FROM: z.string().default("Duskline <no-reply@duskline.local>"),
  MAIL_DIR: z.string().default(".data/mail"),
  UPLOAD_MAX_BYTES: z.coerce.number().int().positive().default(500 * 1024 * 1024),
  API_MAX_BODY_BYTES: z.coerce.number().int().positive().default(64 * 1024 * 1024),
  // Set by `npm start` / `npm test` on a developer's machine: e-mail goes to the local fake
  // SMTP server, /dev/mail shows it, and the demo seed may run. Never set in a deployment.
  DUSKLINE_LOCAL: z.stringbool().default(false),
  /** Engine worker processes; one per core when unset, 0 runs the engine on the request's thread. */
  ENGINE_PROCESSES: z.coerce.number().int().min(0).max(64).optional(),
  /** How much lower the engine processes' CPU priority is than the web's (nice, 0–19). */
  ENGINE_NICE: z.coerce.number().int().min(0).max(19).default(10),
  /** Memory for rendered pages kept per process (app/utils/page-cache.server.ts), MB; 0 turns it off. */
  PAGE_CACHE_MB: z.coerce.number().min(0).max(1024).default(16),
  /** Project root, where the engine worker file is found (default: the working directory). */
  APP_ROOT: z.string().optional(),
  /** Run queued jobs in this instance (turn off for an instance that should only serve). */
  JOB_RUNNER: z.stringbool().default(true),
  /** How often an idle job runner looks for work, ms. */
  JOB_POLL_MS: z.coerce.number().int().min(50).max(60_000).default(1000),
  /** A running job whose heartbeat is older than this is taken over by another instance, s. */
  JOB_STALE_SECONDS: z.coerce.number().min(1).max(3600).default(30),
  /** Webhooks: delay before the first retry of a failed delivery, doubling after each, ms. */
  WEBHOOK_RETRY_BASE_MS: z.coerce.number().int().min(10).max(3_600_000).default(30_000),
  /** How often each instance looks for due webhook deliveries, ms. */
  WEBHOOK_POLL_MS: z.coerce.number().int().min(50).max(60_000).default(5_000),
  /** API requests a minute per key or signed-in person (a key may carry its own limit). */
  API_RATE_LIMIT_PER_MINUTE: z.coerce.number().int().min(1).default(600),
  /** API requests a minute per client address without a valid credential. */
  API_ANON_RATE_LIMIT_PER_MINUTE: z.coerce.number().int().min(1).default(60),
  /** Secret of the demo API key the local seed creates (never in a deployment). */
  DEMO_API_KEY: z.string().regex(/^[A-Za-z0-9_-]{16,200}$/, "DEMO_API_KEY: 16 to 200 letters, digits, _ or -").default("dl_demo_local_only_key"),
  /** Trust X-Forwarded-For (only behind a proxy that sets it). */
  TRUST_PROXY: z.stringbool().default(false),
});

export type Env = z.infer<typeof envSchema> & { APP_URL: string };

export function parseEnv(source: Record<string, string | undefined>): Env {
  const result = envSchema.safeParse(source);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Invalid environment:\n${lines.join("\n")}`);
  }
  // The local default is this machine's loopback address on PORT: links work for someone at
  // this machine and lead nowhere else.
  const env = { ...result.data, APP_URL: (result.data.APP_URL ?? `http://127.0.0.1:${result.data.PORT}`).replace(/\/$/, "") };
  if (env.NODE_ENV === "production" && env.SESSION_SECRET.startsWith("dev-only")) {
    throw new Error("Invalid environment:\n  SESSION_SECRET: set a real secret in production");
  }
  return env;
}

let cached: Env | undefined;
export function getEnv(): Env {
  cached ??= parseEnv(process.env);
  return cached;
}

/** The base of every link the app mails: APP_URL (without a trailing slash), never the request's Host. */
export function appUrl(): string {
  return getEnv().APP_URL;
}
