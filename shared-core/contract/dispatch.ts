import { InputError, formatInputError } from '../errors.js';
import { jsonPath } from '../scenario/json-path.js';
import { ServiceFailure, type ImplementationOf, type MethodTable, type ServiceReply } from './define.js';

/**
 * Validates a request against its method's schema, calls the implementation and wraps the
 * outcome in the reply envelope. Both transports call exactly this, so a malformed payload is
 * refused the same way over IPC and over HTTP.
 */
export async function dispatch<T extends MethodTable>(
  table: T,
  implementation: ImplementationOf<T>,
  methodName: string,
  payload: unknown,
): Promise<ServiceReply> {
  if (!Object.prototype.hasOwnProperty.call(table, methodName))
    return { ok: false, error: { code: 'unknown-method', message: `unknown service method '${methodName}'` } };
  const spec = table[methodName];
  const parsed = spec.request.safeParse(payload ?? {});
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    return {
      ok: false,
      error: { code: 'bad-request', message: `${methodName}: ${issue.message}`, where: jsonPath(issue.path) },
    };
  }
  try {
    const handler = implementation[methodName as keyof T] as (request: unknown) => Promise<unknown>;
    const result = await handler(parsed.data);
    return { ok: true, result };
  } catch (error) {
    if (error instanceof ServiceFailure)
      return { ok: false, error: { code: error.code, message: error.message, where: error.where } };
    if (error instanceof InputError)
      return { ok: false, error: { code: 'bad-request', message: formatInputError(error) } };
    return { ok: false, error: { code: 'internal', message: (error as Error).message ?? String(error) } };
  }
}
