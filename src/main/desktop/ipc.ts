/**
 * The IPC side of the contract: one `ipcMain.handle` per allowlisted channel (channels.ts) and no
 * other. A message is answered only when it comes from the app's own page in the top frame
 * (`event.senderFrame`); its payload is checked against the method's schema before the service
 * runs (dispatch.ts). Every reply is `{ ok: true, value } | { ok: false, kind, error, … }` in the
 * wire encoding, so nothing the renderer receives is an Error object with a main-process stack.
 *
 *   registerIpc({ services, isAppDocument, log? }): () => void   (the function removes the handlers)
 */
import { ipcMain, type IpcMainInvokeEvent } from 'electron';
import { CHANNELS, methodOfChannel, type CallReply } from '../../shared/contract/channels.js';
import { createDispatcher } from '../../shared/contract/dispatch.js';
import type { TauwellServices } from '../../shared/contract/index.js';

export interface IpcOptions {
  services: TauwellServices;
  /** True for the URL of the app's own page (window.ts: AppLocation.isAppDocument). */
  isAppDocument(url: string): boolean;
  /** Where stacks of internal errors go; default stderr. */
  log?: (text: string) => void;
}

export const REFUSED_SENDER = 'refused: the message did not come from the Tauwell window';

export function registerIpc(options: IpcOptions): () => void {
  const dispatch = createDispatcher(options.services);
  const log = options.log ?? ((text: string) => void process.stderr.write(text));
  for (const channel of CHANNELS) {
    const method = methodOfChannel(channel) as string;
    ipcMain.handle(channel, async (event: IpcMainInvokeEvent, payload: unknown): Promise<CallReply> => {
      if (!fromAppWindow(event, options.isAppDocument)) {
        log(`tauwell: refused ${channel} from ${event.senderFrame?.url ?? 'a frame that is gone'}\n`);
        return { ok: false, kind: 'refused', error: REFUSED_SENDER };
      }
      const outcome = await dispatch(method, payload);
      if (outcome.ok) return { ok: true, value: outcome.value };
      switch (outcome.kind) {
        case 'input':
          return { ok: false, kind: 'input', error: outcome.error, reason: outcome.reason, ...(outcome.field !== undefined ? { field: outcome.field } : {}) };
        case 'unknown-method':
          return { ok: false, kind: 'refused', error: outcome.error };
        case 'internal': {
          const c = outcome.cause;
          log(`tauwell: internal error in ${outcome.method}: ${c instanceof Error ? (c.stack ?? c.message) : String(c)}\n`);
          return { ok: false, kind: 'internal', error: outcome.error };
        }
      }
    });
  }
  return () => {
    for (const channel of CHANNELS) ipcMain.removeHandler(channel);
  };
}

/** The app's page in a top-level frame; a sub-frame, a foreign page or a frame that is gone is refused. */
function fromAppWindow(event: IpcMainInvokeEvent, isAppDocument: (url: string) => boolean): boolean {
  const frame = event.senderFrame;
  if (frame === null || frame === undefined) return false;
  if (frame.parent !== null && frame.parent !== undefined) return false;
  return isAppDocument(frame.url);
}
