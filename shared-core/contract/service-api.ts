import { z } from 'zod';
import { method } from './define.js';

/**
 * The one service API of Holdfast: every call the renderer can make of the main process.
 * Transports: IPC channel `holdfast:<name>` (src-main/shell) and `POST /api/<name>` on the local
 * web host (src-main/web-host). Implementation: src-main/service.
 */
export const serviceApi = {
  'app.info': method(
    'Version, store location and whether the store holds the invented demonstration data.',
    z.strictObject({}),
    z.object({ version: z.string(), storePath: z.string(), demo: z.boolean() }),
  ),
} as const;

export type ServiceApiTable = typeof serviceApi;
export type ServiceMethodName = keyof ServiceApiTable;
