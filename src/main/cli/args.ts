/**
 * Command-line options: one declarative list per command, from which both the parser and the
 * help text are made, so that a documented option cannot go missing from the parser or the
 * other way round. Every error is an InputError naming the option (`--csv`) as its field.
 */
import { InputError } from '../../shared/errors.js';

export interface OptionSpec {
  /** Long name without the dashes, e.g. 'time-unit'. */
  name: string;
  /** Flags take no value; everything else takes exactly one. */
  kind: 'flag' | 'value';
  /** Placeholder in the help text, e.g. 'FILE', 'C', 'MPa'. */
  placeholder?: string;
  /** One line of help, naming the unit of the value. */
  help: string;
  required?: boolean;
  /** Accepted values, checked by the parser and listed in the help. */
  choices?: readonly string[];
  /** Default shown in the help (the command applies it). */
  defaultText?: string;
}

export interface CommandSpec {
  name: string;
  summary: string;
  usage: string;
  options: readonly OptionSpec[];
  /** Paragraphs printed after the options in `--help`. */
  notes?: readonly string[];
}

export const HELP_OPTION: OptionSpec = { name: 'help', kind: 'flag', help: 'print this help and exit' };

export class ParsedArgs {
  constructor(
    private readonly values: ReadonlyMap<string, string | true>,
  ) {}

  has(name: string): boolean {
    return this.values.has(name);
  }

  flag(name: string): boolean {
    return this.values.get(name) === true;
  }

  /** The value of option `name`, or undefined when it was not given. */
  string(name: string): string | undefined {
    const v = this.values.get(name);
    return typeof v === 'string' ? v : undefined;
  }

  requireString(name: string): string {
    const v = this.string(name);
    if (v === undefined) throw new InputError('missing required option', { field: `--${name}` });
    return v;
  }

  /** A finite number, or undefined when the option was not given. */
  number(name: string): number | undefined {
    const text = this.string(name);
    if (text === undefined) return undefined;
    return parseOptionNumber(text, name);
  }

  requireNumber(name: string): number {
    return parseOptionNumber(this.requireString(name), name);
  }

  /** A number > 0, or undefined when the option was not given. */
  positive(name: string): number | undefined {
    const v = this.number(name);
    if (v !== undefined && !(v > 0)) throw new InputError(`must be greater than zero (got ${v})`, { field: `--${name}` });
    return v;
  }

  /** A whole number ≥ `min`, or undefined when the option was not given. */
  integer(name: string, min: number): number | undefined {
    const v = this.number(name);
    if (v !== undefined && !(Number.isInteger(v) && v >= min)) {
      throw new InputError(`must be a whole number ≥ ${min} (got ${this.string(name)})`, { field: `--${name}` });
    }
    return v;
  }
}

/** Decimal numbers as people type them: optional sign, point as the decimal mark, optional exponent. */
const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

export function parseDecimal(text: string): number | undefined {
  const t = text.trim();
  if (!NUMBER.test(t)) return undefined;
  const v = Number(t);
  return Number.isFinite(v) ? v : undefined;
}

function parseOptionNumber(text: string, name: string): number {
  const v = parseDecimal(text);
  if (v === undefined) throw new InputError(`${JSON.stringify(text)} is not a number`, { field: `--${name}` });
  return v;
}

/**
 * Parses `--name value`, `--name=value` and `--flag`. A value may start with '-' (a negative
 * number) but not with '--'. Unknown options, repeated options, stray arguments and missing
 * required options are errors; `--help` suppresses the required check so it always works.
 */
export function parseArgs(spec: CommandSpec, argv: readonly string[]): ParsedArgs {
  const byName = new Map(spec.options.map((o) => [o.name, o]));
  byName.set(HELP_OPTION.name, HELP_OPTION);
  const values = new Map<string, string | true>();
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (!arg.startsWith('--') || arg === '--') {
      throw new InputError(`unexpected argument ${JSON.stringify(arg)}; options start with --; see \`tauwell ${spec.name} --help\``, { field: arg });
    }
    const eq = arg.indexOf('=');
    const name = arg.slice(2, eq < 0 ? undefined : eq);
    const option = byName.get(name);
    if (option === undefined) {
      throw new InputError(`unknown option for \`tauwell ${spec.name}\`; known: ${[...byName.keys()].map((n) => `--${n}`).join(', ')}`, { field: `--${name}` });
    }
    if (values.has(name)) throw new InputError('given more than once', { field: `--${name}` });
    if (option.kind === 'flag') {
      if (eq >= 0) throw new InputError('takes no value', { field: `--${name}` });
      values.set(name, true);
      continue;
    }
    let value: string;
    if (eq >= 0) value = arg.slice(eq + 1);
    else {
      const next = argv[i + 1];
      if (next === undefined || next.startsWith('--')) {
        throw new InputError(`needs a value${option.placeholder ? ` (${option.placeholder})` : ''}`, { field: `--${name}` });
      }
      value = next;
      i++;
    }
    if (option.choices !== undefined && !option.choices.includes(value)) {
      throw new InputError(`${JSON.stringify(value)} is not one of ${option.choices.join(', ')}`, { field: `--${name}` });
    }
    values.set(name, value);
  }
  if (!values.has('help')) {
    for (const option of spec.options) {
      if (option.required === true && !values.has(option.name)) {
        throw new InputError(`missing required option${option.placeholder ? ` ${option.placeholder}` : ''}: ${option.help}`, { field: `--${option.name}` });
      }
    }
  }
  return new ParsedArgs(values);
}

/** The `--help` text of one command: usage, summary, every option with its unit, notes. */
export function commandHelp(spec: CommandSpec): string {
  const lines = [`Usage: ${spec.usage}`, '', spec.summary, '', 'Options:'];
  lines.push(...optionLines([...spec.options, HELP_OPTION]));
  for (const note of spec.notes ?? []) lines.push('', ...wrap(note, 78));
  return lines.join('\n') + '\n';
}

export function optionLines(options: readonly OptionSpec[]): string[] {
  const heads = options.map((o) => `  --${o.name}${o.placeholder ? ` ${o.placeholder}` : ''}`);
  const width = Math.max(...heads.map((h) => h.length)) + 2;
  return options.map((o, i) => {
    const extra: string[] = [];
    if (o.choices !== undefined) extra.push(`one of: ${o.choices.join(', ')}`);
    if (o.defaultText !== undefined) extra.push(`default: ${o.defaultText}`);
    if (o.required === true) extra.push('required');
    const text = o.help + (extra.length > 0 ? ` (${extra.join('; ')})` : '');
    const body = wrap(text, Math.max(30, 100 - width));
    return [heads[i].padEnd(width) + body[0], ...body.slice(1).map((b) => ' '.repeat(width) + b)].join('\n');
  });
}

function wrap(text: string, width: number): string[] {
  const out: string[] = [];
  let line = '';
  for (const word of text.split(/\s+/)) {
    if (line !== '' && line.length + 1 + word.length > width) {
      out.push(line);
      line = word;
    } else line = line === '' ? word : `${line} ${word}`;
  }
  out.push(line);
  return out;
}
