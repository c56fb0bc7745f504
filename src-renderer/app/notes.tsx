import type { ReactNode } from 'react';
import { ServiceCallError } from '../bridge.js';
import { describeField } from '../../shared-core/present/field-words.js';

/** Request fields of the service that a person typed, by the label of their field. */
const REQUEST_FIELDS: Record<string, string> = {
  author: 'Your initials',
  preparedBy: 'Initials',
  note: 'Note',
  name: 'Name',
  date: 'Date on the memo',
  lot: 'Round trades to lots of',
  recommended: 'Candidate the memo recommends',
  rationale: 'Your reasons',
};

/**
 * An error as a person reads it: what went wrong, and the field it is about by its label (never
 * a JSON path); a file's line and column stay, since they point into the file.
 */
export function errorText(error: unknown): string {
  if (error instanceof ServiceCallError) {
    const where = error.where;
    if (!where) return error.message;
    if (/:\d+(:\d+)?$/.test(where)) return `${error.message} (at ${where})`;
    if (where.startsWith('document.') || where === 'document') {
      const path = where.replace(/^document\.?/, '') || '(document)';
      return describeField(path, error.message);
    }
    const label = REQUEST_FIELDS[where.split(/[.[]/)[0]];
    return label ? `${label}: ${error.message}` : error.message;
  }
  if (error instanceof Error) return error.message;
  return String(error);
}

export function ErrorNote({ error, title }: { error: unknown; title?: string }) {
  return (
    <div className="note error" role="alert">
      {title ? <strong>{title}: </strong> : null}
      {errorText(error)}
    </div>
  );
}

export function Note({ kind, children }: { kind?: 'warning' | 'done'; children: ReactNode }) {
  return <div className={`note${kind ? ` ${kind}` : ''}`}>{children}</div>;
}

export function Loading({ what }: { what: string }) {
  return (
    <p className="muted" role="status">
      Reading {what}…
    </p>
  );
}
