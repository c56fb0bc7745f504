import type { ReactNode } from 'react';
import { ServiceCallError } from '../bridge.js';

/** An error as a person reads it: what went wrong, and where in the request when known. */
export function errorText(error: unknown): string {
  if (error instanceof ServiceCallError) return error.where ? `${error.message} (at ${error.where})` : error.message;
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
