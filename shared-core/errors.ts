/**
 * Errors that point at the input that caused them. The core knows line, column and JSON path;
 * the edge that read the file adds its name, so every message a user sees names file, line,
 * column or JSON path (the brief's rule for bad input).
 */
export interface InputLocation {
  file?: string;
  line?: number;
  column?: number;
  /** JSON path such as `candidates[2].objective.method`. */
  path?: string;
}

export class InputError extends Error {
  constructor(
    message: string,
    readonly location: InputLocation = {},
  ) {
    super(message);
    this.name = 'InputError';
  }

  /** A copy of this error with the file name filled in (the core never knows it). */
  inFile(file: string): InputError {
    return new InputError(this.message, { ...this.location, file });
  }
}

/** `prices.csv:12:3: message`, `scenario.json: candidates[0].id: message`, or the bare message. */
export function formatInputError(error: InputError): string {
  const { file, line, column, path } = error.location;
  let where = file ?? '';
  if (line !== undefined) where += `${where ? ':' : 'line '}${line}`;
  if (column !== undefined) where += `:${column}`;
  if (path !== undefined) where += `${where ? ': ' : ''}${path}`;
  return where ? `${where}: ${error.message}` : error.message;
}
