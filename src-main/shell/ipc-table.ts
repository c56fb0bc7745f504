import { dispatch } from '../../shared-core/contract/dispatch.js';
import type { ImplementationOf, MethodTable, ServiceReply } from '../../shared-core/contract/define.js';

/**
 * The IPC side of the one service API: one channel per service method, derived from the table,
 * declared nowhere else. There is no generic "invoke anything" channel: the preload maps a
 * method name to its own channel, and the main process registers exactly these handlers, each of
 * which validates its payload through `dispatch` before the implementation sees it.
 */
export const CHANNEL_PREFIX = 'holdfast:';

export function channelOf(method: string): string {
  return `${CHANNEL_PREFIX}${method}`;
}

export interface IpcRoute {
  method: string;
  channel: string;
}

export function ipcRoutes(table: MethodTable): IpcRoute[] {
  return Object.keys(table).map((method) => ({ method, channel: channelOf(method) }));
}

/** Frames allowed to call: the app's own pages (see app-protocol.ts), nothing else. */
export type SenderCheck = (senderUrl: string | undefined) => boolean;

export type IpcHandler = (senderUrl: string | undefined, payload: unknown) => Promise<ServiceReply>;

/** The handler of every channel, keyed by channel; `electron-main` hands each to `ipcMain.handle`. */
export function ipcHandlers<T extends MethodTable>(
  table: T,
  implementation: ImplementationOf<T>,
  isTrustedSender: SenderCheck,
): Map<string, IpcHandler> {
  const handlers = new Map<string, IpcHandler>();
  for (const { method, channel } of ipcRoutes(table)) {
    if (handlers.has(channel)) throw new Error(`two service methods map to IPC channel ${channel}`);
    handlers.set(channel, async (senderUrl, payload) => {
      if (!isTrustedSender(senderUrl))
        return {
          ok: false,
          error: { code: 'bad-request', message: `${method}: refused a call from ${senderUrl ?? 'an unknown frame'}` },
        };
      return dispatch(table, implementation, method, payload);
    });
  }
  return handlers;
}
