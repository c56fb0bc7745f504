import type { ServiceReply } from '../../shared-core/contract/define.js';

/** The HTTP status that goes with a service reply (the body is always the reply envelope). */
export function replyStatus(reply: ServiceReply): number {
  if (reply.ok) return 200;
  switch (reply.error.code) {
    case 'bad-request':
      return 400;
    case 'unknown-method':
    case 'not-found':
      return 404;
    case 'conflict':
    case 'cancelled':
      return 409;
    case 'busy':
      return 503;
    case 'storage':
      return 507;
    default:
      return 500;
  }
}
