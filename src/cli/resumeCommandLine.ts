/** An argument as a POSIX shell reads it back: as it is when plain, else in single quotes. */
function shellWord(word: string): string {
  return /^[\w@%+=:,./-]+$/.test(word) ? word : `'${word.replaceAll("'", "'\\''")}'`;
}

/** The command line as a shell would take it back, `arcsift` first. */
export function commandLine(args: readonly string[]): string {
  return ['arcsift', ...args].map(shellWord).join(' ');
}

/**
 * The command line that continues an interrupted run: the same arguments with --resume added
 * (and, for `demo`, --no-fresh, which keeps the earlier run to resume).
 */
export function resumeCommandLine(args: readonly string[]): string {
  const words = [...args];
  if (words[0] === 'demo' && !words.includes('--no-fresh')) words.push('--no-fresh');
  if (!words.includes('--resume')) words.push('--resume');
  return commandLine(words);
}
