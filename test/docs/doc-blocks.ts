/**
 * The executable parts of a Markdown page, in page order: the commands of its fenced `sh` blocks,
 * the files its fenced blocks with a file name write (```csv my-prices.csv), and the output a
 * fenced `text` block right after an `sh` block promises. test/docs/examples.test.ts runs them, so
 * the pages cannot drift from the program without a test failing.
 */
export type DocStep =
  | { kind: 'file'; line: number; name: string; text: string }
  | { kind: 'command'; line: number; command: string; exit: number }
  | { kind: 'output'; line: number; expected: string[] };

/** A command's expected exit status, from a trailing comment `# exit N` (default 0). */
const EXIT_NOTE = /\s+#\s*exit\s+(\d+)\s*$/;

export function docSteps(markdown: string): DocStep[] {
  const lines = markdown.split('\n');
  const steps: DocStep[] = [];
  let lastWasSh = false;
  for (let i = 0; i < lines.length; i++) {
    const open = /^```(\S*)(?:\s+(\S+))?\s*$/.exec(lines[i]);
    if (!open || open[1] === '') {
      if (lines[i].trim() !== '') lastWasSh = false;
      continue;
    }
    const start = i;
    const body: string[] = [];
    for (i++; i < lines.length && !/^```\s*$/.test(lines[i]); i++) body.push(lines[i]);
    const [, language, name] = open;
    if (name !== undefined) steps.push({ kind: 'file', line: start + 1, name, text: `${body.join('\n')}\n` });
    else if (language === 'sh') steps.push(...commandsOf(body, start + 2));
    else if (language === 'text' && lastWasSh)
      steps.push({ kind: 'output', line: start + 1, expected: body.map((l) => l.trim()).filter((l) => l !== '') });
    lastWasSh = language === 'sh' && name === undefined;
  }
  return steps;
}

/** The commands of an `sh` block: comments and blank lines dropped, `\` continuations joined. */
function commandsOf(body: string[], firstLine: number): DocStep[] {
  const steps: DocStep[] = [];
  let pending = '';
  let pendingLine = firstLine;
  body.forEach((raw, k) => {
    if (pending === '') pendingLine = firstLine + k;
    const text = raw.trimEnd();
    if (pending === '' && (text.trim() === '' || text.trim().startsWith('#'))) return;
    if (text.endsWith('\\')) {
      pending += `${text.slice(0, -1).trim()} `;
      return;
    }
    const full = `${pending}${text.trim()}`;
    pending = '';
    const note = EXIT_NOTE.exec(full);
    steps.push({
      kind: 'command',
      line: pendingLine,
      command: note ? full.slice(0, note.index) : full.replace(/\s+#.*$/, ''),
      exit: note ? Number(note[1]) : 0,
    });
  });
  return steps;
}
