import { InputError } from '../errors.js';

/**
 * JSON.parse with a syntax error that names line and column. V8's own message carries no
 * position for many errors, so on failure a small scanner walks the text to find where it breaks.
 */
export function parseJsonText(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch (error) {
    const offset = findSyntaxErrorOffset(text);
    const before = text.slice(0, offset);
    const line = before.split('\n').length;
    const column = offset - before.lastIndexOf('\n');
    const found = offset < text.length ? `'${text[offset]}'` : 'end of text';
    // V8's words without its position or its echo of the text ("Expected ',' or '}' after
    // property value"): the line and column say where, and the words may themselves hold commas.
    const words = (error as Error).message
      .replace(/\s*(in JSON )?at position \d+[\s\S]*$/, '')
      .replace(/, "[\s\S]*" is not valid JSON$/, '');
    throw new InputError(`not valid JSON (${words}): unexpected ${found}`, {
      line,
      column,
    });
  }
}

/** Offset of the first character at which `text` stops being JSON (RFC 8259). */
export function findSyntaxErrorOffset(text: string): number {
  let i = 0;
  const fail = (): never => {
    throw i;
  };
  const ws = () => {
    while (i < text.length && ' \t\n\r'.includes(text[i])) i++;
  };
  const literal = (word: string) => {
    for (const ch of word) {
      if (text[i] !== ch) fail();
      i++;
    }
  };
  const string = () => {
    i++;
    while (i < text.length && text[i] !== '"') {
      if (text[i] === '\\') {
        i++;
        if (text[i] === 'u') {
          for (let k = 0; k < 4; k++) if (!/[0-9a-fA-F]/.test(text[++i] ?? '')) fail();
        } else if (!'"\\/bfnrt'.includes(text[i] ?? 'x')) fail();
      } else if (text.charCodeAt(i) < 0x20) fail();
      i++;
    }
    if (text[i] !== '"') fail();
    i++;
  };
  const number = () => {
    const m = /^-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/.exec(text.slice(i));
    if (!m || m[0] === '' || m[0] === '-') fail();
    i += m![0].length;
  };
  const value = (): void => {
    ws();
    const ch = text[i];
    if (ch === '{') {
      i++;
      ws();
      if (text[i] === '}') return void i++;
      for (;;) {
        ws();
        if (text[i] !== '"') fail();
        string();
        ws();
        if (text[i] !== ':') fail();
        i++;
        value();
        ws();
        if (text[i] === ',') i++;
        else if (text[i] === '}') return void i++;
        else fail();
      }
    } else if (ch === '[') {
      i++;
      ws();
      if (text[i] === ']') return void i++;
      for (;;) {
        value();
        ws();
        if (text[i] === ',') i++;
        else if (text[i] === ']') return void i++;
        else fail();
      }
    } else if (ch === '"') string();
    else if (ch === 't') literal('true');
    else if (ch === 'f') literal('false');
    else if (ch === 'n') literal('null');
    else if (ch === '-' || (ch >= '0' && ch <= '9')) number();
    else fail();
  };
  try {
    value();
    ws();
    if (i < text.length) fail();
    return text.length;
  } catch (offset) {
    return typeof offset === 'number' ? Math.min(offset, text.length) : 0;
  }
}
