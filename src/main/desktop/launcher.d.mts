// Types of launcher.mjs (plain JavaScript, so that `npm start` runs before anything is built).
export declare const PROJECT_ROOT: string;
export declare const DEMO_DB: string;
export type ElectronBinary = { installed: true; binary: string } | { installed: false; reason: string };
export declare function detectElectron(root?: string): ElectronBinary;
