import { z } from 'zod';

/**
 * The shell's own channels beside the service API: two native file dialogs (the page cannot see
 * the disk, so the main process asks the user) and one main-to-page event for menu commands.
 */
export const DIALOG_CHANNELS = { open: 'holdfast-dialog:open', save: 'holdfast-dialog:save' } as const;
export const MENU_CHANNEL = 'holdfast-menu';
/** Opens a printed memo in the system's PDF viewer (shell/memo-viewer.ts). */
export const MEMO_VIEWER_CHANNEL = 'holdfast-memo:open';

const filter = z.strictObject({
  name: z.string().min(1).max(80),
  extensions: z
    .array(z.string().regex(/^[A-Za-z0-9]{1,10}$/, 'expected an extension such as csv'))
    .min(1)
    .max(10),
});

export const openDialogRequest = z.strictObject({
  title: z.string().max(120).optional(),
  filters: z.array(filter).max(10).optional(),
});

export const saveDialogRequest = z.strictObject({
  title: z.string().max(120).optional(),
  /** File name only: the user chooses the folder. */
  defaultName: z
    .string()
    .max(200)
    .regex(/^[^/\\]*$/, 'a file name, not a path')
    .optional(),
  filters: z.array(filter).max(10).optional(),
});

export type DialogAnswer =
  { ok: true; path: string | null } | { ok: false; error: { code: 'bad-request'; message: string } };

/** Validates a dialog request; a malformed one is answered without opening any dialog. */
export function checkDialogRequest(
  kind: 'open' | 'save',
  payload: unknown,
): { ok: true; value: z.infer<typeof saveDialogRequest> } | { ok: false; answer: DialogAnswer } {
  const parsed = (kind === 'open' ? openDialogRequest : saveDialogRequest).safeParse(payload ?? {});
  if (parsed.success) return { ok: true, value: parsed.data };
  const issue = parsed.error.issues[0];
  return {
    ok: false,
    answer: {
      ok: false,
      error: { code: 'bad-request', message: `${kind} dialog: ${issue.path.join('.') || 'request'}: ${issue.message}` },
    },
  };
}
