/**
 * Where the command line writes, and what it reads from its environment. Injectable so that
 * tests run `main` in-process and read what it printed.
 */
export interface TextSink {
  write(text: string): unknown;
}

export interface CliIo {
  stdout: TextSink;
  stderr: TextSink;
  /** Environment variables (TAUWELL_DEBUG=1 prints stacks of internal errors). */
  env: Readonly<Record<string, string | undefined>>;
  /** Folder that relative file names are resolved against. */
  cwd: string;
}

export function resolveIo(io: Partial<CliIo> = {}): CliIo {
  if (io.stdout === undefined) quietOnClosedPipe();
  return {
    stdout: io.stdout ?? process.stdout,
    stderr: io.stderr ?? process.stderr,
    env: io.env ?? process.env,
    cwd: io.cwd ?? process.cwd(),
  };
}

let pipeGuarded = false;

/** `tauwell … | head` closes stdout early; that is the reader's choice, not an error worth a stack trace. */
function quietOnClosedPipe(): void {
  if (pipeGuarded) return;
  pipeGuarded = true;
  process.stdout.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE') process.exit(process.exitCode ?? 0);
    throw e;
  });
}
