/**
 * Who may talk to the loopback server. The server listens on 127.0.0.1 only, but any web page the
 * user opens can still send requests to 127.0.0.1, so:
 *   - the Host header must name this server as 127.0.0.1:PORT or localhost:PORT, which defeats DNS
 *     rebinding (a hostile name resolved to 127.0.0.1 arrives with its own name in Host);
 *   - an Origin header, when present, must be this server's own origin, so another site's script
 *     is refused even before the token is looked at;
 *   - every API call carries the launch's random token (`Authorization: Bearer …` or
 *     `X-Tauwell-Token`), compared in constant time.
 */
import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';
import type { IncomingHttpHeaders } from 'node:http';

/** 32 random bytes as hex: a new one at every launch. */
export function newToken(): string {
  return randomBytes(32).toString('hex');
}

export function allowedHosts(port: number): readonly string[] {
  return [`127.0.0.1:${port}`, `localhost:${port}`];
}

export function hostAllowed(host: string | undefined, port: number): boolean {
  return host !== undefined && allowedHosts(port).includes(host.trim().toLowerCase());
}

/** No Origin (a same-origin GET, curl) is fine; a present one must be this server's own. */
export function originAllowed(origin: string | undefined, port: number): boolean {
  if (origin === undefined) return true;
  return allowedHosts(port).some((h) => origin.trim().toLowerCase() === `http://${h}`);
}

/** The token a request carries, from `Authorization: Bearer …` or `X-Tauwell-Token`, if any. */
export function tokenOf(headers: IncomingHttpHeaders): string | undefined {
  const auth = headers.authorization;
  if (auth !== undefined) {
    const m = /^Bearer\s+(\S+)\s*$/i.exec(auth);
    return m === null ? '' : m[1];
  }
  const own = headers['x-tauwell-token'];
  return typeof own === 'string' ? own.trim() : undefined;
}

/**
 * Constant-time comparison. Both sides are hashed first so the buffers compared have the same
 * length whatever was sent: the time taken says nothing about the token's length or its prefix.
 */
export function tokenMatches(given: string | undefined, token: string): boolean {
  if (given === undefined) return false;
  const a = createHash('sha256').update(given, 'utf8').digest();
  const b = createHash('sha256').update(token, 'utf8').digest();
  return timingSafeEqual(a, b);
}
