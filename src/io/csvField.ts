/**
 * One CSV field as RFC 4180 writes it: as is when it holds no comma, quote or line break,
 * otherwise in double quotes with each quote doubled (the inverse of splitCsvLine). A field
 * starting with "#" is quoted too, so that a line beginning with it is not read as a comment.
 */
export function csvField(value: string | number | boolean | null | undefined): string {
  if (value === null || value === undefined) return '';
  const text = String(value);
  return /[",\r\n]/.test(text) || text.startsWith('#') ? `"${text.replaceAll('"', '""')}"` : text;
}
