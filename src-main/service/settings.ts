import { mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import { z } from 'zod';
import { InputError } from '../../shared-core/errors.js';
import { issueToInputError } from '../../shared-core/scenario/json-path.js';
import type { Settings } from '../../shared-core/contract/service-api.js';

/**
 * The advisor's settings (the initials printed on memos and signed on revisions), kept in a
 * small JSON file beside the store so a backup of the store does not carry one person's
 * preferences to another machine. Written to a temporary file and renamed, so a crash never
 * leaves half a file.
 */
const fileSchema = z.object({ preparedBy: z.string().nullable().default(null) });

export interface SettingsKeeper {
  get(): Settings;
  set(settings: Settings): Settings;
}

export function settingsKeeper(path: string | undefined): SettingsKeeper {
  let current: Settings = path ? readSettings(path) : { preparedBy: null };
  return {
    get: () => ({ ...current }),
    set(settings) {
      if (path) {
        mkdirSync(dirname(path), { recursive: true });
        const temporary = `${path}.${process.pid}.tmp`;
        writeFileSync(temporary, `${JSON.stringify(settings, null, 2)}\n`, { mode: 0o600 });
        renameSync(temporary, path);
      }
      current = { ...settings };
      return { ...current };
    },
  };
}

function readSettings(path: string): Settings {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return { preparedBy: null };
    throw error;
  }
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (error) {
    throw new InputError(`not JSON (${(error as Error).message})`, { file: path });
  }
  const parsed = fileSchema.safeParse(value);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw issueToInputError({ code: issue.code, path: issue.path, message: issue.message }).inFile(path);
  }
  return parsed.data;
}
