import { parseArgs, type ParseArgsConfig } from 'node:util';
import { CliError } from './cli-error';

/** node:util parseArgs, with its errors turned into one-line CliErrors. */
export function parseCommandArgs<T extends NonNullable<ParseArgsConfig['options']>>(
  argv: string[],
  options: T,
  allowPositionals = false,
) {
  try {
    return parseArgs({ args: argv, options, allowPositionals, strict: true });
  } catch (error) {
    throw new CliError(error instanceof Error ? error.message : String(error));
  }
}

/** Parses a positive whole number option, naming the option when it is not one. */
export function positiveInteger(value: string | undefined, name: string): number | undefined {
  if (value === undefined) return undefined;
  if (!/^\d+$/.test(value) || Number(value) <= 0) {
    throw new CliError(`--${name} must be a whole number above 0, got "${value}"`);
  }
  return Number(value);
}
