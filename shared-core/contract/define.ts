import type { z } from 'zod';

/**
 * The machinery of the one service API: each method is a named pair of zod schemas. The table
 * in `service-api.ts` is the single source of truth; the Electron IPC bridge and the local web
 * host are two transports over `dispatch`, and the renderer's bridge is typed from the same table.
 */
export interface MethodSpec<Req extends z.ZodType = z.ZodType, Res extends z.ZodType = z.ZodType> {
  request: Req;
  response: Res;
  summary: string;
}

export function method<Req extends z.ZodType, Res extends z.ZodType>(
  summary: string,
  request: Req,
  response: Res,
): MethodSpec<Req, Res> {
  return { summary, request, response };
}

export type MethodTable = Record<string, MethodSpec>;

export type RequestOf<T extends MethodTable, K extends keyof T> = z.input<T[K]['request']>;
export type ParsedRequestOf<T extends MethodTable, K extends keyof T> = z.output<T[K]['request']>;
export type ResponseOf<T extends MethodTable, K extends keyof T> = z.output<T[K]['response']>;

/** What the renderer calls. */
export type ClientOf<T extends MethodTable> = {
  [K in keyof T]: (request: RequestOf<T, K>) => Promise<ResponseOf<T, K>>;
};

/** What the main process implements: it receives requests already validated. */
export type ImplementationOf<T extends MethodTable> = {
  [K in keyof T]: (request: ParsedRequestOf<T, K>) => Promise<ResponseOf<T, K>>;
};

/**
 * `busy`: another writer holds the store past the busy timeout (try again); `storage`: the store
 * cannot be written (read-only, disk full, disk error). Both messages name the file and what to do.
 */
export type ServiceErrorCode =
  'bad-request' | 'unknown-method' | 'not-found' | 'conflict' | 'cancelled' | 'busy' | 'storage' | 'internal';

export interface ServiceError {
  code: ServiceErrorCode;
  message: string;
  /** JSON path inside the request, or file:line:column for an input file. */
  where?: string;
}

/** The envelope both transports carry. */
export type ServiceReply<R = unknown> = { ok: true; result: R } | { ok: false; error: ServiceError };

/** Thrown by an implementation to answer with a specific error code. */
export class ServiceFailure extends Error {
  constructor(
    readonly code: ServiceErrorCode,
    message: string,
    readonly where?: string,
  ) {
    super(message);
    this.name = 'ServiceFailure';
  }
}
