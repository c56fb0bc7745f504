import { describe, expect, it } from 'vitest';
import { InputError } from '../../../shared-core/errors.js';
import { parseJsonText } from '../../../shared-core/scenario/json-text.js';

/** What a scenario file that is not JSON is told: V8's words, whole, and the line and column. */
function failure(text: string): InputError {
  try {
    parseJsonText(text);
  } catch (error) {
    if (error instanceof InputError) return error;
    throw error;
  }
  throw new Error('parsed');
}

describe('a JSON syntax error', () => {
  it("keeps V8's words whole, commas and all, and points at the line and column", () => {
    const error = failure('{\n  "name": "x"\n  "baseCurrency": "EUR"\n}');
    expect(error.message).toBe("not valid JSON (Expected ',' or '}' after property value): unexpected '\"'");
    expect(error.location).toMatchObject({ line: 3, column: 3 });
  });

  it('does not echo the text back', () => {
    const error = failure('[1, 2,]');
    expect(error.message).toBe("not valid JSON (Unexpected token ']'): unexpected ']'");
  });
});
