import { createContext, useContext, useEffect, useId, useRef, useState, type ReactNode } from 'react';
import './fields.css';

/**
 * Bumped by the page on undo, redo and loading a document: a field then shows the document's
 * value even while it has focus. Otherwise a focused field keeps what is being typed, so clearing
 * it (which may put an implied value such as a 100% cap in the document) never rewrites the text
 * under the cursor.
 */
export const EditorEpoch = createContext(0);

/** Applies a message's one-change fix (a button beside the message); provided by the page. */
export const ApplyFix = createContext<((path: (string | number)[], value: unknown) => void) | null>(null);

/** A message's fix as a button, where the page can apply it. */
export function FixButton({ fix }: { fix: FieldMessage['fix'] }) {
  const apply = useContext(ApplyFix);
  if (!fix || !apply) return null;
  return (
    <button type="button" className="fix" onClick={() => apply(fix.path, fix.value)}>
      {fix.label}
    </button>
  );
}

function useFieldText(
  value: number | undefined,
  show: (value: number | undefined) => string,
  path: string,
  onTyping: (path: string, message: string | null) => void,
) {
  const [text, setText] = useState(show(value));
  const emitted = useRef(value);
  const input = useRef<HTMLInputElement>(null);
  const epoch = useContext(EditorEpoch);
  const seenEpoch = useRef(epoch);
  useEffect(() => {
    const forced = epoch !== seenEpoch.current;
    seenEpoch.current = epoch;
    if (value === emitted.current && !forced) return;
    if (!forced && input.current && document.activeElement === input.current) return;
    emitted.current = value;
    setText(show(value));
    onTyping(path, null);
  }, [value, epoch, path, onTyping, show]);
  return { text, setText, emitted, input };
}
import { parsePercentInput, percentInputText } from '../format.js';
import type { FieldMessage } from '../validate-draft.js';

/**
 * The editor's input fields. Each shows the reason beside itself when what was typed is wrong
 * (the scenario schema's message, or the check that failed), tied to the input with
 * aria-describedby so a screen reader reads it with the field.
 */
export interface FieldProps {
  label: ReactNode;
  /** JSON path of the value, as the schema's messages name it. */
  path: string;
  messages: readonly FieldMessage[];
  hint?: ReactNode;
  /** Hide the visible label (the column header of a table says it); kept for screen readers. */
  compact?: boolean;
}

export function FieldNote({ id, messages, hint }: { id: string; messages: readonly FieldMessage[]; hint?: ReactNode }) {
  if (messages.length === 0 && !hint) return null;
  return (
    <span id={id} className="field-note">
      {messages.map((m, i) => (
        <span key={i} className="field-error" data-path={m.path}>
          <span className="marker" aria-hidden="true">
            ◆
          </span>{' '}
          {m.message} <FixButton fix={m.fix} />
        </span>
      ))}
      {messages.length === 0 && hint ? <span className="field-hint">{hint}</span> : null}
    </span>
  );
}

function useNoteId(): string {
  return `note-${useId().replace(/:/g, '')}`;
}

/** A field's frame: its label (hidden where a column header says it), the control, its note. */
function FieldFrame({
  kind,
  label,
  compact,
  inputId,
  noteId,
  messages,
  hint,
  children,
}: Pick<FieldProps, 'label' | 'compact' | 'messages' | 'hint'> & {
  kind: string;
  inputId: string;
  noteId: string;
  children: ReactNode;
}) {
  return (
    <span className={`sfield ${kind}${compact ? ' compact' : ''}`}>
      <label htmlFor={inputId} className={compact ? 'visually-hidden' : undefined}>
        {label}
      </label>
      {children}
      <FieldNote id={noteId} messages={messages} hint={hint} />
    </span>
  );
}

const SHOW_PERCENT = {
  1: (v: number | undefined) => percentInputText(v, 1),
  2: (v: number | undefined) => percentInputText(v, 2),
};
const numberText = (value: number | undefined) => (value === undefined ? '' : String(value));

/** What a typed text means: a number, or the reason it is not one. */
type Parsed = { value: number } | { message: string };

const parsePercent = (text: string): Parsed => {
  const value = parsePercentInput(text);
  return value === null ? { message: `'${text}' is not a number; type a percentage such as 15 or 12.5` } : { value };
};
const parseNumber = (text: string): Parsed => {
  const cleaned = text.trim().replace(',', '.');
  return /^[-+]?(\d+(\.\d*)?|\.\d+)$/.test(cleaned)
    ? { value: Number(cleaned) }
    : { message: `'${text}' is not a number` };
};

export interface NumberFieldProps extends FieldProps {
  value: number | undefined;
  onChange: (value: number | undefined) => void;
  onTyping: (path: string, message: string | null) => void;
  placeholder?: string;
  disabled?: boolean;
}

/**
 * A number typed as text, with its unit beside it. Text that is not a number is reported
 * (through `onTyping`) and kept in the field, so the advisor sees what they typed beside the
 * reason; an empty field removes the value unless `optional` is false.
 */
function TypedNumberField(
  props: NumberFieldProps & {
    kind: 'percent-field' | 'number-field';
    unit?: string;
    show: (value: number | undefined) => string;
    parse: (text: string) => Parsed;
    optional?: boolean;
  },
) {
  const { label, path, messages, hint, value, onChange, onTyping, placeholder, unit, compact, disabled } = props;
  const { text, setText, emitted, input } = useFieldText(value, props.show, path, onTyping);
  const noteId = useNoteId();
  const inputId = `${noteId}-in`;
  const optional = props.optional ?? true;
  const change = (next: string) => {
    setText(next);
    if (next.trim() === '') {
      onTyping(path, optional ? null : 'a value is needed here');
      if (optional) {
        emitted.current = undefined;
        onChange(undefined);
      }
      return;
    }
    const parsed = props.parse(next);
    if ('message' in parsed) {
      onTyping(path, parsed.message);
      return;
    }
    onTyping(path, null);
    emitted.current = parsed.value;
    onChange(parsed.value);
  };
  const invalid = messages.length > 0;
  return (
    <FieldFrame {...{ label, compact, messages, hint, inputId, noteId }} kind={props.kind}>
      <span className="input-with-unit">
        <input
          ref={input}
          id={inputId}
          type="text"
          inputMode="decimal"
          value={text}
          placeholder={placeholder}
          disabled={disabled}
          aria-invalid={invalid || undefined}
          aria-describedby={invalid || hint ? noteId : undefined}
          data-path={path}
          onChange={(e) => change(e.target.value)}
        />
        {unit ? (
          <span className="unit" aria-hidden="true">
            {unit}
          </span>
        ) : null}
      </span>
    </FieldFrame>
  );
}

/** A weight or rate typed as per cent; the document keeps the fraction. */
export function PercentField(
  props: NumberFieldProps & {
    /** Empty means "no limit" (the key is removed); false: a value is needed. */
    optional?: boolean;
    /** Decimals of a per cent the field shows for a value it did not type (default 2). */
    decimals?: 1 | 2;
  },
) {
  return (
    <TypedNumberField
      {...props}
      kind="percent-field"
      unit="%"
      show={SHOW_PERCENT[props.decimals ?? 2]}
      parse={parsePercent}
    />
  );
}

/** A plain number (years, half-life, lambda, basis points) with its unit. */
export function NumberField(props: NumberFieldProps & { unit?: string }) {
  return <TypedNumberField {...props} kind="number-field" show={numberText} parse={parseNumber} />;
}

/** Free text the schema checks (dates YYYY-MM-DD, names). */
export function TextField(
  props: FieldProps & {
    value: string | undefined;
    onChange: (value: string | undefined) => void;
    placeholder?: string;
  },
) {
  const { label, path, messages, hint, value, onChange, placeholder, compact } = props;
  const noteId = useNoteId();
  const inputId = `${noteId}-in`;
  const invalid = messages.length > 0;
  return (
    <FieldFrame {...{ label, compact, messages, hint, inputId, noteId }} kind="text-field">
      <input
        id={inputId}
        type="text"
        value={value ?? ''}
        placeholder={placeholder}
        aria-invalid={invalid || undefined}
        aria-describedby={invalid || hint ? noteId : undefined}
        data-path={path}
        onChange={(e) => onChange(e.target.value === '' ? undefined : e.target.value)}
      />
    </FieldFrame>
  );
}

export function SelectField<T extends string>(
  props: FieldProps & {
    value: T;
    options: readonly { value: T; label: string }[];
    onChange: (value: T) => void;
  },
) {
  const { label, path, messages, hint, value, options, onChange, compact } = props;
  const noteId = useNoteId();
  const inputId = `${noteId}-in`;
  return (
    <FieldFrame {...{ label, compact, messages, hint, inputId, noteId }} kind="select-field">
      <select
        id={inputId}
        value={value}
        data-path={path}
        aria-describedby={messages.length > 0 || hint ? noteId : undefined}
        onChange={(e) => onChange(e.target.value as T)}
      >
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </FieldFrame>
  );
}
