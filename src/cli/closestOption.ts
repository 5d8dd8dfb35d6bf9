/** Edits (insertions, deletions, substitutions) between two strings: Levenshtein (1966) distance by the two-row recurrence. */
function editDistance(a: string, b: string): number {
  let previous = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const current = [i];
    for (let j = 1; j <= b.length; j++) {
      current[j] = Math.min(previous[j] + 1, current[j - 1] + 1, previous[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
    }
    previous = current;
  }
  return previous[b.length];
}

/**
 * The known option nearest a mistyped one, when it is near enough to be meant: at most 3 edits
 * (the threshold yargs uses for commands) and fewer than half the name's length, so that short
 * names do not all look alike. Undefined otherwise.
 */
export function closestOption(name: string, known: readonly string[]): string | undefined {
  let best: string | undefined;
  let bestDistance = Number.POSITIVE_INFINITY;
  for (const candidate of known) {
    const distance = editDistance(name, candidate);
    if (distance < bestDistance) {
      best = candidate;
      bestDistance = distance;
    }
  }
  return bestDistance <= 3 && bestDistance < name.length / 2 ? best : undefined;
}

/**
 * The long options (`--name`, `--name=value`, `--no-name`) of a command line that are not among
 * `known`, in order, each once.
 */
export function unknownOptionNames(args: readonly string[], known: readonly string[]): string[] {
  const unknown: string[] = [];
  for (const arg of args) {
    if (arg === '--') break;
    const match = /^--([^=]+)/.exec(arg);
    if (match === null) continue;
    const name = match[1];
    const plain = name.startsWith('no-') && known.includes(name.slice(3)) ? name.slice(3) : name;
    if (!known.includes(plain) && !unknown.includes(name)) unknown.push(name);
  }
  return unknown;
}
