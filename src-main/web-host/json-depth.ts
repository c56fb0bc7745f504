/**
 * The deepest nesting of arrays and objects in a JSON text, found by one pass that skips
 * strings. The service's documents nest a handful of levels; a request nested thousands deep
 * would only overflow the stack of whatever walks it later (validation, canonical JSON), so the
 * host refuses it before parsing.
 */
export function jsonDepth(text: string): number {
  let depth = 0;
  let deepest = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c)
        i++; // backslash: skip the escaped character
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) inString = true;
    else if (c === 0x5b || c === 0x7b) deepest = Math.max(deepest, ++depth);
    else if (c === 0x5d || c === 0x7d) depth--;
  }
  return deepest;
}
