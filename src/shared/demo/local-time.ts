/** An instant as a plant's data system prints it: naive local wall-clock time, dd.mm.yyyy HH:MM. */

const formats = new Map<string, Intl.DateTimeFormat>();

/** `timeMs` (UTC epoch ms) on the wall clock of the IANA `zone`, without an offset. */
export function formatLocal(timeMs: number, zone: string): string {
  let format = formats.get(zone);
  if (format === undefined) {
    format = new Intl.DateTimeFormat('en-GB', {
      timeZone: zone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit',
    });
    formats.set(zone, format);
  }
  const part: Record<string, string> = {};
  for (const p of format.formatToParts(new Date(timeMs))) part[p.type] = p.value;
  return `${part.day}.${part.month}.${part.year} ${part.hour}:${part.minute}`;
}
