import { InputError } from '../errors.js';

/** `['candidates', 2, 'objective', 'method']` -> `candidates[2].objective.method` */
export function jsonPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) {
    if (typeof key === 'number') out += `[${key}]`;
    else out += out ? `.${String(key)}` : String(key);
  }
  return out || '(document)';
}

interface ZodLikeIssue {
  code: string;
  path: readonly PropertyKey[];
  message: string;
  values?: readonly unknown[];
  input?: unknown;
  keys?: readonly string[];
  /** Set by `describedUnion` callers: the allowed discriminator values. */
  options?: readonly string[];
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null;
}

/**
 * One readable message per schema issue, naming its JSON path:
 * `candidates[2].objective.method: unknown method 'max-div'; expected one of max-diversification, ...`.
 */
export function issueToInputError(issue: ZodLikeIssue): InputError {
  const path = jsonPath(issue.path);
  const last = issue.path[issue.path.length - 1];
  const field = typeof last === 'string' ? last : 'value';
  let message = issue.message;
  if (issue.code === 'invalid_value' && issue.values) {
    const got = issue.input === undefined ? 'nothing' : `'${String(issue.input)}'`;
    message = `unknown ${field} ${got}; expected one of ${issue.values.map(String).join(', ')}`;
  } else if (issue.code === 'invalid_union' && issue.options && isRecord(issue.input)) {
    const got = issue.input[field];
    message = `unknown ${field} ${got === undefined ? '(missing)' : `'${String(got)}'`}; expected one of ${issue.options.join(', ')}`;
  } else if (issue.code === 'unrecognized_keys' && issue.keys) {
    message = `unknown key${issue.keys.length > 1 ? 's' : ''} ${issue.keys.map((k) => `'${k}'`).join(', ')}`;
  }
  return new InputError(message, { path });
}
