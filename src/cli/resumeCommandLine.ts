/** An argument as a POSIX shell reads it back: as it is when plain, else in single quotes. */
function shellWord(word: string): string {
  return /^[\w@%+=:,./-]+$/.test(word) ? word : `'${word.replaceAll("'", "'\\''")}'`;
}

/**
 * The command line that continues an interrupted run: the same arguments with --resume added
 * (and, for `demo`, --no-fresh, which keeps the earlier run to resume).
 */
export function resumeCommandLine(args: readonly string[]): string {
  const words = [...args];
  if (words[0] === 'demo' && !words.includes('--no-fresh')) words.push('--no-fresh');
  if (!words.includes('--resume')) words.push('--resume');
  return ['arcsift', ...words].map(shellWord).join(' ');
}
