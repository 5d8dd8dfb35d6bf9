/**
 * The URL of a compiled worker script next to `moduleUrl`. Worker threads need JavaScript, so
 * when the caller runs from TypeScript sources (the test runner) the compiled copy under dist/
 * is used instead (`npm test` builds it first).
 */
export function workerScriptUrl(moduleUrl: string, scriptName: string): URL {
  const url = new URL(scriptName, moduleUrl);
  if (moduleUrl.endsWith('.ts')) {
    return new URL(url.href.replace('/src/', '/dist/'));
  }
  return url;
}
