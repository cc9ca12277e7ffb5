import { describe, expect, it } from "vitest";
import { parseEnv } from "../../app/utils/env.server";

describe("environment validation", () => {
  it("fills development defaults", () => {
    const env = parseEnv({});
    expect(env.PORT).toBe(3000);
    expect(env.DB_PORT).toBe(3307);
    expect(env.NODE_ENV).toBe("development");
    expect(env.DUSKLINE_LOCAL).toBe(false);
    expect(env.UPLOAD_MAX_BYTES).toBe(500 * 1024 * 1024);
  });

  it("defaults APP_URL to loopback on PORT and refuses a non-http one", () => {
    expect(parseEnv({}).APP_URL).toBe("http://127.0.0.1:3000");
    expect(parseEnv({ PORT: "4100" }).APP_URL).toBe("http://127.0.0.1:4100");
    expect(parseEnv({ APP_URL: "https://duskline.example/" }).APP_URL).toBe("https://duskline.example");
    expect(() => parseEnv({ APP_URL: "javascript:alert(1)" })).toThrow(/APP_URL/);
  });

  it("coerces numbers and booleans from strings", () => {
    const env = parseEnv({ PORT: "8080", DB_PORT: "3999", DUSKLINE_LOCAL: "true", TRUST_PROXY: "false" });
    expect(env.PORT).toBe(8080);
    expect(env.DB_PORT).toBe(3999);
    expect(env.DUSKLINE_LOCAL).toBe(true);
    expect(env.TRUST_PROXY).toBe(false);
  });

  it("names each bad variable", () => {
    expect(() => parseEnv({ PORT: "eighty", SESSION_SECRET: "short" })).toThrow(/PORT[\s\S]*SESSION_SECRET: SESSION_SECRET must be at least 16/);
  });

  it("refuses the development session secret in production", () => {
    expect(() => parseEnv({ NODE_ENV: "production" })).toThrow(/SESSION_SECRET: set a real secret/);
    expect(parseEnv({ NODE_ENV: "production", SESSION_SECRET: "a-real-secret-of-some-length" }).NODE_ENV).toBe("production");
  });
});
