import type { Asset, Holdings } from '../../../shared-core/contract/service-api.js';
import type { EditorState } from '../editor-state.js';
import type { FieldMessage } from '../validate-draft.js';

/**
 * What every part of the brief is given by the page: the editor's state, how to change it, the
 * messages of the fields, the asset catalogue and the household's holdings.
 */
export interface BriefProps {
  state: EditorState;
  commit: (next: EditorState, key?: string) => void;
  /** An edit applied to the latest state: stable, so memoised rows need not re-render. */
  update: (edit: (state: EditorState) => EditorState, key?: string) => void;
  messages: readonly FieldMessage[];
  onTyping: (path: string, message: string | null) => void;
  catalogue: readonly Asset[];
  holdings: Holdings | null;
  locale?: string;
}

/** A weight bound pair [lower, upper], as the scenario file writes it. */
export type Bound = [number, number];
