import { UsageError, type CommandSpec, type OptionValues } from './command.js';

/**
 * Parses `--name value`, `--name=value` and boolean `--flag` against a command's option specs.
 * Anything it does not know is a one-line UsageError naming the bad word.
 */
export function parseOptions(command: CommandSpec, argv: readonly string[]): OptionValues {
  const values: OptionValues = {};
  for (let i = 0; i < argv.length; i++) {
    const word = argv[i];
    if (!word.startsWith('--')) throw new UsageError(`unexpected argument '${word}' for '${command.name}'`);
    const eq = word.indexOf('=');
    const name = word.slice(2, eq === -1 ? undefined : eq);
    const spec = command.options.find((o) => o.name === name);
    if (!spec) throw new UsageError(`unknown option '--${name}' for '${command.name}'`);
    if (name in values) throw new UsageError(`option '--${name}' given twice`);
    if (spec.kind === 'boolean') {
      if (eq !== -1) throw new UsageError(`option '--${name}' takes no value`);
      values[name] = true;
      continue;
    }
    let raw: string | undefined;
    if (eq !== -1) raw = word.slice(eq + 1);
    else {
      raw = argv[i + 1];
      if (raw === undefined || raw.startsWith('--')) throw new UsageError(`option '--${name}' needs a value`);
      i++;
    }
    if (spec.choices && !spec.choices.includes(raw))
      throw new UsageError(`unknown value '${raw}' for '--${name}'; expected one of ${spec.choices.join(', ')}`);
    if (spec.kind === 'number') {
      const n = Number(raw);
      if (raw.trim() === '' || !Number.isFinite(n))
        throw new UsageError(`option '--${name}' needs a number, got '${raw}'`);
      values[name] = n;
    } else values[name] = raw;
  }
  for (const spec of command.options)
    if (spec.required && values[spec.name] === undefined)
      throw new UsageError(`'${command.name}' needs --${spec.name}${spec.valueName ? ` ${spec.valueName}` : ''}`);
  return values;
}

export function commandHelp(command: CommandSpec): string {
  const lines = [`holdfast ${command.name}: ${command.summary}`, '', 'Options:'];
  for (const o of command.options) {
    const value =
      o.kind === 'boolean' ? '' : ` ${o.valueName ?? (o.choices ? o.choices.join('|') : o.kind.toUpperCase())}`;
    const flag = `  --${o.name}${value}${o.required ? '' : ' (optional)'}`;
    // A flag too long for the column (a list of choices) puts its description on the next line.
    lines.push(flag.length < 44 ? flag.padEnd(44) + o.description : `${flag}\n${' '.repeat(44)}${o.description}`);
  }
  if (command.details) lines.push('', command.details);
  return lines.join('\n') + '\n';
}
