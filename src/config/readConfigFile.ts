import { readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { InputError } from '../errors.js';

/** Reads a YAML or JSON config file (JSON is read by the YAML parser too) into plain data. */
export function readConfigFile(path: string): unknown {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (error) {
    throw new InputError(`cannot read the config file (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})`, { file: path });
  }
  try {
    return parse(text, { prettyErrors: true, uniqueKeys: true });
  } catch (error) {
    const first = (error as Error).message.split('\n')[0];
    throw new InputError(`not valid YAML or JSON: ${first}`, { file: path });
  }
}
