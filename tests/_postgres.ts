/**
 * A throwaway PostgreSQL server for tests: Debian's `postgresql` binaries, a data folder in a
 * temporary folder, no TCP at all (a unix socket in that folder only), stopped and removed
 * after. As root, the server runs as the `postgres` user (initdb refuses root).
 *
 * @module
 */

import { join } from "node:path";

/** Where Debian puts the server binaries. */
const BIN_DIRS = [
  "/usr/lib/postgresql/17/bin",
  "/usr/lib/postgresql/16/bin",
  "/usr/lib/postgresql/15/bin",
];

/** A running throwaway server. */
export interface Postgres {
  /** Run SQL through psql; returns stdout. */
  sql(text: string): Promise<string>;
  /** Stop the server and remove its folder. */
  stop(): Promise<void>;
}

function binDir(): string | undefined {
  for (const d of BIN_DIRS) {
    try {
      if (Deno.statSync(join(d, "initdb")).isFile) return d;
    } catch {
      // not this version
    }
  }
  return undefined;
}

async function exec(cmd: string, args: string[], asUser?: string): Promise<string> {
  const [c, a] = asUser ? ["/usr/sbin/runuser", ["-u", asUser, "--", cmd, ...args]] : [cmd, args];
  const out = await new Deno.Command(c, { args: a, stdout: "piped", stderr: "piped" }).output();
  const text = new TextDecoder().decode(out.stdout);
  if (!out.success) {
    throw new Error(`${cmd} failed: ${new TextDecoder().decode(out.stderr).trim() || text}`);
  }
  return text;
}

function userIds(name: string): { uid: number; gid: number } | undefined {
  for (const line of Deno.readTextFileSync("/etc/passwd").split("\n")) {
    const f = line.split(":");
    if (f[0] === name) return { uid: Number(f[2]), gid: Number(f[3]) };
  }
  return undefined;
}

/**
 * Start a throwaway server, or return the reason it cannot start (the tests then skip with
 * that message).
 */
export async function startPostgres(): Promise<Postgres | string> {
  const bin = binDir();
  if (!bin) return "PostgreSQL is not installed (apt-get install postgresql)";
  const root = Deno.uid() === 0;
  const ids = root ? userIds("postgres") : undefined;
  if (root && !ids) return "running as root and there is no postgres user to run the server";
  const dir = await Deno.makeTempDir({ prefix: "lentil-pg-" });
  const user = root ? "postgres" : undefined;
  try {
    if (ids) await Deno.chown(dir, ids.uid, ids.gid);
    const data = join(dir, "data");
    await exec(join(bin, "initdb"), [
      "-D",
      data,
      "-A",
      "trust",
      "-U",
      "lentil",
      "-E",
      "UTF8",
      "--no-sync",
    ], user);
    await exec(
      join(bin, "pg_ctl"),
      [
        "-D",
        data,
        "-l",
        join(dir, "log"),
        "-w",
        "-o",
        `-k ${dir} -c listen_addresses= -F`,
        "start",
      ],
      user,
    );
  } catch (e) {
    await Deno.remove(dir, { recursive: true }).catch(() => {});
    return `the PostgreSQL server did not start: ${(e as Error).message}`;
  }
  return {
    async sql(text) {
      const f = join(dir, `q${crypto.randomUUID().slice(0, 8)}.sql`);
      await Deno.writeTextFile(f, text);
      if (ids) await Deno.chown(f, ids.uid, ids.gid);
      return await exec(
        join(bin, "psql"),
        [
          "-X",
          "-q",
          "-A",
          "-t",
          "-v",
          "ON_ERROR_STOP=1",
          "-h",
          dir,
          "-U",
          "lentil",
          "-d",
          "postgres",
          "-f",
          f,
        ],
        user,
      );
    },
    async stop() {
      await exec(join(bin, "pg_ctl"), ["-D", join(dir, "data"), "-m", "fast", "-w", "stop"], user)
        .catch(() => {});
      await Deno.remove(dir, { recursive: true }).catch(() => {});
    },
  };
}
