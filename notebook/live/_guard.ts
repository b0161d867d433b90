/**
 * Who may talk to the live server: requests must name our own host and port (so a page on
 * another site cannot reach us through DNS rebinding), carry no foreign Origin, and present
 * the session's unguessable token.
 *
 * @module
 */

/** What the guard needs to know about the server. */
export interface GuardConfig {
  /** Port the server listens on. */
  readonly port: number;
  /** The session token. */
  readonly token: string;
}

/** A refusal: HTTP status and a short reason. */
export interface Refusal {
  /** HTTP status. */
  readonly status: number;
  /** Reason (sent to the client; says nothing secret). */
  readonly reason: string;
}

/**
 * A fresh token: 32 random bytes from `crypto.getRandomValues`, base64url.
 *
 * @example
 * ```ts
 * import { newToken } from "./_guard.ts";
 * newToken().length; // 43
 * ```
 */
export function newToken(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(32));
  return btoa(String.fromCharCode(...bytes)).replace(/\+/g, "-").replace(/\//g, "_").replace(
    /=+$/,
    "",
  );
}

/** Compare without an early exit, so timing says nothing about the token. */
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

/**
 * Check a request; undefined when it may proceed.
 *
 * @example
 * ```ts
 * import { checkRequest } from "./_guard.ts";
 * const req = new Request("http://127.0.0.1:8123/api/state", { headers: { host: "evil.example" } });
 * checkRequest(req, { port: 8123, token: "t" })?.status; // 403
 * ```
 */
export function checkRequest(req: Request, config: GuardConfig): Refusal | undefined {
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
  const given = req.headers.get("x-lentil-token") ?? url.searchParams.get("t") ?? "";
  if (!sameText(given, config.token)) return { status: 403, reason: "missing or wrong token" };
  if (req.method === "POST") {
    const type = (req.headers.get("content-type") ?? "").split(";")[0].trim().toLowerCase();
    if (type !== "application/json") return { status: 415, reason: "expected application/json" };
  } else if (req.method !== "GET") {
    return { status: 405, reason: "method not allowed" };
  }
  return undefined;
}
