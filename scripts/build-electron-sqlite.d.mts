// Types of build-electron-sqlite.mjs (plain JavaScript, so that it runs before anything is built).
export declare const PROJECT_ROOT: string;
export declare const ELECTRON_ADDON: string;
export declare const HEADERS_URL: string;
export declare class UsageError extends Error {}

export interface BuildOptions {
  dryRun: boolean;
  help: boolean;
  electronVersion?: string;
  arch?: string;
  nodedir?: string;
  nodeGyp?: string;
}
export interface Machine {
  root: string;
  env: Record<string, string | undefined>;
  execPath: string;
  platform: string;
  arch: string;
  home: string;
}
export interface BuildPlan {
  version: string;
  arch: string;
  source: string;
  nodeBuild: string;
  output: string;
  devdir: string;
  nodedir: string | undefined;
  headersUrl: string;
  nodeGypCandidates: string[];
  gypArgs: string[];
}
export type Probe = (url: string) => Promise<string | undefined>;
export interface MainDeps extends Partial<Machine> {
  tmp?: string;
  probe?: Probe;
  run?: (command: string, args: string[], cwd: string) => number;
  out?: (text: string) => void;
  err?: (text: string) => void;
}

export declare function parseArgs(argv: readonly string[]): BuildOptions;
export declare function electronVersion(root: string): string;
export declare function nodeGypCandidates(ctx: Machine & { nodeGyp?: string }): string[];
export declare function planBuild(options: BuildOptions, ctx: Machine): BuildPlan;
export declare function checkHeaders(plan: BuildPlan, probe: Probe): Promise<string | undefined>;
export declare function main(argv: readonly string[], deps?: MainDeps): Promise<number>;
