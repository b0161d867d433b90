/**
 * `lentil live FILE [--port N]`: edit a notebook in a local web page. Serves on 127.0.0.1
 * only, on a free port unless `--port` names one, under an address that holds an
 * unguessable key (`http://127.0.0.1:PORT/KEY/`); runs until the page's End session button
 * or an interrupt (Ctrl+C) ends the session.
 *
 * Permissions: the `lentil` task grants read and write (the notebook's folder is all this
 * command touches: the file, the CSV files its tables name, their `.bak` backups and
 * temporary files) and network on 127.0.0.1 only. Deno cannot narrow read and write to
 * one folder once granted, so run it as
 * `deno run --allow-read=DIR --allow-write=DIR --allow-net=127.0.0.1 notebook/cli/main.ts live FILE`
 * to confine it further. Once serving, it gives up any run, ffi, env and sys permission the
 * process had: it spawns nothing and reads neither the environment nor the system.
 *
 * @module
 */

import { basename } from "node:path";
import type { Command } from "../command.ts";
import { NotebookFileError, readNotebookBytes } from "../../load.ts";

/** The `live` command. */
export const liveCommand: Command = {
  name: "live",
  summary: "edit a notebook in a local web page, with results updated as you type",
  usage: "FILE [--port N]",
  help: "Serves FILE as an editable page on 127.0.0.1 and prints its address, which holds a key\n" +
    "that only this session knows. Inputs, formulas and table rows are edited in place; every\n" +
    "result that depends on an edit is recomputed at once. Save writes FILE back, changing only\n" +
    "what was edited, and keeps the previous version as FILE.bak. The page's End session\n" +
    "button ends the session; so does an interrupt here (Ctrl+C).",
  options: {
    port: { type: "string", doc: "port on 127.0.0.1 (default: a free one)", value: "N" },
  },
  positionals: [1, 1],
  async run([file], options, io) {
    const port = options.port === undefined ? 0 : Number(options.port);
    if (!Number.isInteger(port) || port < 0 || port > 65535) {
      io.err(`lentil live: --port expects a number from 0 to 65535, got "${options.port}"`);
      return 2;
    }
    if (!file.endsWith(".lentil.md")) {
      io.err(`${file}: notebook files end in .lentil.md`);
      return 2;
    }
    try {
      await readNotebookBytes(file);
    } catch (e) {
      if (e instanceof NotebookFileError) {
        io.err(e.message);
        return 1;
      }
      throw e;
    }
    let server;
    try {
      const { startLiveServer } = await import("../../live/server.ts");
      const { progressPrinter } = await import("../../progress.ts");
      // The address is printed as soon as the server listens: the page shows how far
      // opening has come, as this terminal does for a large table.
      server = await startLiveServer(file, {
        port,
        onListening: (url) => {
          io.out(`Lentil is serving ${basename(file)} for editing in your browser:`);
          io.out(`  ${url}`);
          io.out("The address holds this session's key: keep it to yourself.");
          io.out(
            "End the session with the page's End session button, or interrupt here (Ctrl+C).",
          );
        },
        onProgress: progressPrinter(),
      });
    } catch (e) {
      io.err(`lentil live: ${(e as Error).message}`);
      return 1;
    }
    // Nothing below spawns, loads native code, reads the environment or the system.
    for (const name of ["run", "ffi", "env", "sys"] as const) Deno.permissions.revokeSync({ name });
    const stop = () => void server.shutdown();
    Deno.addSignalListener("SIGINT", stop);
    try {
      await server.finished;
    } finally {
      Deno.removeSignalListener("SIGINT", stop);
    }
    const how = server.endedFromPage ? "from the page" : "by the interrupt";
    if (server.session.status().dirty) {
      io.err(`session ended ${how}, with unsaved changes (they were not written)`);
    } else io.out(`session ended ${how}`);
    return 0;
  },
};
