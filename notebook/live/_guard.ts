/**
 * Who may talk to the live server: requests must name our own host and port (so a page on
 * another site cannot reach us through DNS rebinding), carry no foreign Origin, and have the
 * session's unguessable key as the first part of their path (`/KEY/…`): the page's address
 * holds it, so its script, style and calls, all relative to that address, carry it too.
 *
 * @module
 */

/** What the guard needs to know about the server. */
export interface GuardConfig {
  /** Port the server listens on. */
  readonly port: number;
  /** The session's key. */
  readonly key: string;
}

/** A refusal: HTTP status and a short reason. */
export interface Refusal {
  /** HTTP status. */
  readonly status: number;
  /** Reason (sent to the client; says nothing secret). */
  readonly reason: string;
}

/**
 * A fresh key: 32 random bytes from `crypto.getRandomValues`, base64url.
 *
 * @example
 * ```ts
 * import { newKey } from "./_guard.ts";
 * newKey().length; // 43
 * ```
 */
export function newKey(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(32));
  return btoa(String.fromCharCode(...bytes)).replace(/\+/g, "-").replace(/\//g, "_").replace(
    /=+$/,
    "",
  );
}

/** Compare without an early exit, so timing says nothing about the key. */
function sameText(a: string, b: string): boolean {
  const x = new TextEncoder().encode(a);
  const y = new TextEncoder().encode(b);
  let diff = x.length ^ y.length;
  for (let i = 0; i < Math.max(x.length, y.length); i++) diff |= (x[i] ?? 0) ^ (y[i] ?? 0);
  return diff === 0;
}

/**
 * The origins the page itself has.
 *
 * @example
 * ```ts
 * import { ownOrigins } from "./_guard.ts";
 * ownOrigins(8123)[0]; // "http://127.0.0.1:8123"
 * ```
 */
export function ownOrigins(port: number): string[] {
  return [`http://127.0.0.1:${port}`, `http://localhost:${port}`];
}

/** A request that may proceed, with its path below the key. */
export interface Admitted {
  /** The path after `/KEY` (at least `/`). */
  readonly path: string;
}

/**
 * Check a request: a refusal, or the path below the key when it may proceed.
 *
 * @example
 * ```ts
 * import { checkRequest } from "./_guard.ts";
 * const req = new Request("http://127.0.0.1:8123/k/api/state", { headers: { host: "evil.example" } });
 * "status" in checkRequest(req, { port: 8123, key: "k" }); // true
 * const ok = new Request("http://127.0.0.1:8123/k/api/state", { headers: { host: "127.0.0.1:8123" } });
 * checkRequest(ok, { port: 8123, key: "k" }); // { path: "/api/state" }
 * ```
 */
export function checkRequest(req: Request, config: GuardConfig): Refusal | Admitted {
  const host = req.headers.get("host") ?? "";
  const hosts = ownOrigins(config.port).map((o) => o.slice("http://".length));
  if (!hosts.includes(host.toLowerCase())) return { status: 403, reason: "foreign Host header" };
  const origin = req.headers.get("origin");
  if (origin !== null && !ownOrigins(config.port).includes(origin)) {
    return { status: 403, reason: "foreign Origin header" };
  }
  const site = req.headers.get("sec-fetch-site");
  if (site !== null && site !== "same-origin" && site !== "none") {
    return { status: 403, reason: "cross-site request" };
  }
  const url = new URL(req.url);
  const [, first = "", ...rest] = url.pathname.split("/");
  if (!sameText(first, config.key)) {
    return { status: 403, reason: "this address does not hold the session's key" };
  }
  if (req.method === "POST") {
    const type = (req.headers.get("content-type") ?? "").split(";")[0].trim().toLowerCase();
    if (type !== "application/json") return { status: 415, reason: "expected application/json" };
  } else if (req.method !== "GET") {
    return { status: 405, reason: "method not allowed" };
  }
  return { path: "/" + rest.join("/") };
}
