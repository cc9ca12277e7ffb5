// Small HTTP client for integration tests against the served app (started in global-setup).
import { randomUUID } from "node:crypto";

export const baseUrl = () => process.env.TEST_BASE_URL ?? "http://127.0.0.1:3390";

export const DEMO_PASSWORD = "duskline-demo";

/** A distinct client address per test, so the per-address sign-in limits do not interfere. */
export function newAddress(): string {
  const b = randomUUID().replace(/-/g, "");
  return `10.${parseInt(b.slice(0, 2), 16)}.${parseInt(b.slice(2, 4), 16)}.${parseInt(b.slice(4, 6), 16)}`;
}

export interface Client {
  cookie: string;
  address: string;
  get(path: string, init?: RequestInit): Promise<Response>;
  post(path: string, body: Record<string, string> | URLSearchParams, init?: RequestInit): Promise<Response>;
  json(path: string, method: string, body?: unknown): Promise<Response>;
}

export function client(cookie = "", address = newAddress()): Client {
  const c: Client = {
    cookie,
    address,
    async get(path, init = {}) {
      return fetch(baseUrl() + path, {
        redirect: "manual",
        ...init,
        headers: { cookie: c.cookie, "x-forwarded-for": c.address, ...(init.headers ?? {}) },
      });
    },
    async post(path, body, init = {}) {
      const res = await fetch(baseUrl() + path, {
        method: "POST",
        redirect: "manual",
        body: body instanceof URLSearchParams ? body : new URLSearchParams(body),
        ...init,
        headers: {
          cookie: c.cookie,
          "x-forwarded-for": c.address,
          "content-type": "application/x-www-form-urlencoded",
          ...(init.headers ?? {}),
        },
      });
      const set = res.headers.get("set-cookie");
      if (set) c.cookie = set.split(";")[0];
      return res;
    },
    async json(path, method, body) {
      return fetch(baseUrl() + path, {
        method,
        redirect: "manual",
        body: body === undefined ? undefined : JSON.stringify(body),
        headers: { cookie: c.cookie, "x-forwarded-for": c.address, "content-type": "application/json", accept: "application/json" },
      });
    },
  };
  return c;
}

/** Signs in through the real form action; returns a client carrying the session cookie. */
export async function signIn(email: string, password = DEMO_PASSWORD): Promise<Client> {
  const c = client();
  const res = await c.post("/login", { email, password });
  if (res.status !== 302) throw new Error(`sign-in of ${email} answered ${res.status}`);
  return c;
}
