import { describe, expect, it } from 'vitest';
import { parseJsonText } from '../../../shared-core/scenario/json-text.js';

/** What a scenario file that is not JSON is told: V8's words, whole, and the line and column. */
describe('a JSON syntax error', () => {
  it("keeps V8's words whole, commas and all, and points at the line and column", () => {
    expect(() => parseJsonText('{\n  "name": "x"\n  "baseCurrency": "EUR"\n}')).toThrow(
      expect.objectContaining({
        message: "not valid JSON (Expected ',' or '}' after property value): unexpected '\"'",
        location: expect.objectContaining({ line: 3, column: 3 }),
      }),
    );
  });

  it('does not echo the text back', () => {
    expect(() => parseJsonText('[1, 2,]')).toThrow("not valid JSON (Unexpected token ']'): unexpected ']'");
  });
});
