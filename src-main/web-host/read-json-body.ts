import type { IncomingMessage } from 'node:http';

import { jsonDepth } from './json-depth.js';

export const MAX_BODY_BYTES = 16 * 1024 * 1024;
/** Deeper than any request of the service API (a scenario document nests about eight levels). */
export const MAX_JSON_DEPTH = 64;

export type BodyRead = { ok: true; value: unknown } | { ok: false; status: number; message: string };

/** Reads a JSON request body: at most MAX_BODY_BYTES and MAX_JSON_DEPTH, UTF-8, and says where a syntax error is. */
export async function readJsonBody(request: IncomingMessage, limit = MAX_BODY_BYTES): Promise<BodyRead> {
  const type = request.headers['content-type'] ?? '';
  if (!/^application\/json\b/i.test(type))
    return { ok: false, status: 415, message: `expected Content-Type application/json, got '${type || 'none'}'` };
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of request) {
    size += (chunk as Buffer).length;
    if (size > limit) return { ok: false, status: 413, message: `request body larger than ${limit} bytes` };
    chunks.push(chunk as Buffer);
  }
  const text = Buffer.concat(chunks).toString('utf8');
  if (text.trim() === '') return { ok: true, value: {} };
  const depth = jsonDepth(text);
  if (depth > MAX_JSON_DEPTH)
    return {
      ok: false,
      status: 400,
      message: `request body nests ${depth} levels deep; at most ${MAX_JSON_DEPTH} are accepted`,
    };
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch (error) {
    return { ok: false, status: 400, message: `request body is not valid JSON: ${(error as Error).message}` };
  }
}
