/**
 * Hash routes, so the same bundle works from a file (desktop window) and from the loopback server:
 *   #/field                       field overview
 *   #/decline/<field>/<well>      well decline
 *   #/log[/<field>/<well>]        weekly log
 *   #/import                      import
 *   #/reservoir[/<field>/<name>]  reservoir parameters
 *   #/recharge[/<field>/<well>]   recharge
 *   #/settings                    settings
 * Path parts are URI-encoded (well names may hold spaces or slashes).
 */
export interface Route {
  name: string;
  params: string[];
}

export function parseRoute(hash: string): Route {
  const path = hash.replace(/^#\/?/, '');
  const parts = path === '' ? [] : path.split('/').map((p) => decodeURIComponent(p));
  return { name: parts[0] ?? 'field', params: parts.slice(1) };
}

export function routeTo(name: string, ...params: string[]): string {
  return `#/${[name, ...params].map((p) => encodeURIComponent(p)).join('/')}`;
}
