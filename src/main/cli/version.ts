/** The version in package.json, which sits three folders up from both src/main/cli and dist/main/cli. */
import { readFileSync } from 'node:fs';

export function packageVersion(): string {
  try {
    const json: unknown = JSON.parse(readFileSync(new URL('../../../package.json', import.meta.url), 'utf8'));
    const version = typeof json === 'object' && json !== null ? (json as { version?: unknown }).version : undefined;
    return typeof version === 'string' ? version : 'unknown';
  } catch {
    return 'unknown';
  }
}
