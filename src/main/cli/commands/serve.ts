/**
 * `tauwell serve`: the field log's service API and the built renderer for a browser on this
 * machine, on 127.0.0.1 only, until Ctrl+C (SIGINT) or SIGTERM; then the field log is closed.
 */
import { InputError } from '../../../shared/errors.js';
import { closeServices, createServices } from '../../services/index.js';
import { startLoopbackServer } from '../../server/index.js';
import type { CommandSpec, ParsedArgs } from '../args.js';
import { DB_OPTION, WHO_OPTION, openFieldLog, whoOf } from '../db-access.js';
import type { CliIo } from '../io.js';

export const SERVE_COMMAND: CommandSpec = {
  name: 'serve',
  summary: 'Serve the field log to a browser on this machine: the screens and the API on http://127.0.0.1 only, guarded by a token made at every launch.',
  usage: 'tauwell serve --db FILE [--port N] [--who NAME]',
  options: [
    DB_OPTION,
    { name: 'port', kind: 'value', placeholder: 'N', defaultText: 'a free port chosen by the system', help: 'TCP port on 127.0.0.1, 0 to 65535 (0: a free one)' },
    WHO_OPTION,
  ],
  notes: [
    'Prints the address to open, with the token: http://127.0.0.1:PORT/?token=… — anyone with the token can read and change the field log, so do not share it. The server listens on the loopback address only and refuses other hosts and origins.',
    'Runs until Ctrl+C (or SIGTERM), then closes the field log. The screens are the built renderer (out/renderer/, made by `npx electron-vite build`); without it the page says how to build it.',
  ],
};

const STOP_SIGNALS = ['SIGINT', 'SIGTERM'] as const;

export function runServe(args: ParsedArgs, io: CliIo): Promise<number> {
  return serve(args, io, untilSignal);
}

/**
 * Serves until the promise of `waitForStop` (asked for once the server is up) settles with the
 * reason; the command line waits for the first SIGINT/SIGTERM, tests pass a promise of their own.
 */
export async function serve(args: ParsedArgs, io: CliIo, waitForStop: () => Promise<string>): Promise<number> {
  const port = args.integer('port', 0);
  if (port !== undefined && port > 65535) throw new InputError(`must be a whole number from 0 to 65535 (got ${port})`, { field: '--port' });
  const fdb = openFieldLog(args, io);
  const services = createServices(fdb, { who: whoOf(args), parallelReads: true });
  try {
    let server;
    try {
      server = await startLoopbackServer({ services, ...(port !== undefined ? { port } : {}), log: (text) => io.stderr.write(text) });
    } catch (e) {
      if (e instanceof InputError && e.where.field === 'port') throw new InputError(e.reason, { field: '--port' });
      throw e;
    }
    io.stdout.write([
      `tauwell serve: field log ${args.requireString('db')} on ${server.url} — listening on 127.0.0.1 only (this machine); press Ctrl+C to stop`,
      `${server.url}?token=${server.token}`,
    ].join('\n') + '\n');
    const signal = await waitForStop();
    await server.close();
    io.stdout.write(`tauwell serve: stopped (${signal}); field log closed\n`);
    return 0;
  } finally {
    await closeServices(services);
    fdb.close();
  }
}

function untilSignal(): Promise<string> {
  return new Promise((resolve) => {
    const on = (signal: string): void => {
      for (const s of STOP_SIGNALS) process.off(s, on);
      resolve(signal);
    };
    for (const s of STOP_SIGNALS) process.on(s, on);
  });
}
