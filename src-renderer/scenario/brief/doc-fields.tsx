import { createContext, useContext, type ReactNode } from 'react';
import { getIn, type PathKey } from '../document-edit.js';
import { setField } from '../editor-state.js';
import { messagesAt } from '../validate-draft.js';
import type { BriefProps } from './brief-props.js';
import { NumberField, PercentField, SelectField, TextField, type FieldProps } from './fields.js';

/**
 * Fields bound to one place of the scenario document: given its path, each reads its value and
 * messages there and writes what is typed back (one undo step per field). The brief provides
 * the editor through `BriefContext`.
 */
export const BriefContext = createContext<BriefProps | null>(null);

export function useBrief(): BriefProps {
  const brief = useContext(BriefContext);
  if (!brief) throw new Error('a document field outside the brief');
  return brief;
}

/** A document path as the schema's messages write it: `constraints.groups[0].name`. */
export function pathText(at: readonly PathKey[]): string {
  return at.map((k, i) => (typeof k === 'number' ? `[${k}]` : i === 0 ? k : `.${k}`)).join('');
}

type Bound<P> = Omit<P, keyof FieldProps | 'value' | 'onChange' | 'onTyping'> & {
  label: ReactNode;
  hint?: ReactNode;
  /** Where the value sits in the scenario document. */
  at: readonly PathKey[];
};

function useDocValue(at: readonly PathKey[]) {
  const { state, commit, messages, onTyping } = useBrief();
  const path = pathText(at);
  return {
    path,
    raw: getIn(state.doc, at),
    messages: messagesAt(messages, path),
    onTyping,
    write: (value: unknown) => commit(setField(state, at, value), path),
  };
}

const numberOrNothing = (v: unknown) => (typeof v === 'number' ? v : undefined);

export function DocPercentField({ at, ...rest }: Bound<Parameters<typeof PercentField>[0]>) {
  const { raw, write, ...bound } = useDocValue(at);
  return <PercentField {...rest} {...bound} value={numberOrNothing(raw)} onChange={write} />;
}

export function DocNumberField({ at, ...rest }: Bound<Parameters<typeof NumberField>[0]>) {
  const { raw, write, ...bound } = useDocValue(at);
  return <NumberField {...rest} {...bound} value={numberOrNothing(raw)} onChange={write} />;
}

/** Text; `required` keeps an emptied field as '' (a name) instead of removing the key. */
export function DocTextField({
  at,
  required,
  ...rest
}: Bound<Parameters<typeof TextField>[0]> & { required?: boolean }) {
  const { raw, write, onTyping: _typing, ...bound } = useDocValue(at);
  return (
    <TextField
      {...rest}
      {...bound}
      value={typeof raw === 'string' ? raw : undefined}
      onChange={(v) => write(required ? (v ?? '') : v)}
    />
  );
}

/** A choice; `fallback` is shown while the document leaves the key to the schema's default. */
export function DocSelectField<T extends string>({
  at,
  fallback,
  ...rest
}: Bound<Parameters<typeof SelectField<T>>[0]> & { fallback: T }) {
  const { raw, write, onTyping: _typing, ...bound } = useDocValue(at);
  return <SelectField<T> {...rest} {...bound} value={(raw as T | undefined) ?? fallback} onChange={write} />;
}
