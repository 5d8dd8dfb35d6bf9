import { InputError, expectedFound } from '../errors.js';

/** Splits one CSV line into fields, undoing RFC 4180 quoting ("" inside quotes is one "). */
export function splitCsvLine(line: string, file: string, lineNumber: number): string[] {
  const fields: string[] = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (quoted) {
      if (c === '"' && line[i + 1] === '"') {
        field += '"';
        i++;
      } else if (c === '"') {
        quoted = false;
      } else {
        field += c;
      }
    } else if (c === '"' && field === '') {
      quoted = true;
    } else if (c === ',') {
      fields.push(field);
      field = '';
    } else {
      field += c;
    }
  }
  if (quoted) throw new InputError(`line ${lineNumber}: ${expectedFound('a closing quote', 'the end of the line')}`, { file });
  fields.push(field);
  return fields;
}
