// Name suggestions for unknown names: the nearest candidate by edit distance.

/** Damerau–Levenshtein distance (optimal string alignment: adjacent transpositions count 1). */
export function editDistance(a: string, b: string): number {
  const rows = a.length + 1;
  const cols = b.length + 1;
  const d: number[][] = Array.from({ length: rows }, () => new Array<number>(cols).fill(0));
  for (let i = 0; i < rows; i++) d[i]![0] = i;
  for (let j = 0; j < cols; j++) d[0]![j] = j;
  for (let i = 1; i < rows; i++) {
    for (let j = 1; j < cols; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let best = Math.min(d[i - 1]![j]! + 1, d[i]![j - 1]! + 1, d[i - 1]![j - 1]! + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) {
        best = Math.min(best, d[i - 2]![j - 2]! + 1);
      }
      d[i]![j] = best;
    }
  }
  return d[a.length]![b.length]!;
}

/**
 * The closest candidate, if it is close enough to be a plausible typo: at most a third of the
 * longer name's letters differ (at least one edit allowed), case differences count half. Names
 * of one or two letters only match up to case: any other one-letter name is one edit away,
 * which says nothing.
 */
export function suggestName(name: string, candidates: Iterable<string>): string | undefined {
  let best: string | undefined;
  let bestScore = Number.POSITIVE_INFINITY;
  for (const candidate of candidates) {
    if (candidate === name) continue;
    const exact = editDistance(name, candidate);
    const folded = editDistance(name.toLowerCase(), candidate.toLowerCase());
    const score = Math.min(exact, folded + 0.5);
    const longer = Math.max(name.length, candidate.length);
    const allowed = longer <= 2 ? 0.5 : Math.max(1, Math.floor(longer / 3));
    if (score <= allowed && score < bestScore) {
      best = candidate;
      bestScore = score;
    }
  }
  return best;
}
