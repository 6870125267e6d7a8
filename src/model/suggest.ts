/**
 * "Did you mean ...?" for misspelt field names, enum values, tags and template parameters.
 */

/**
 * Optimal string alignment distance: the number of single-character insertions, deletions,
 * substitutions and swaps of two neighbours that turn a into b ("circel" -> "circle" is 1).
 * Two rolling rows plus the one before them; O(|a| |b|) time, O(|b|) memory.
 */
export function editDistance(a: string, b: string): number {
  const n = b.length;
  let prev2 = new Int32Array(n + 1);
  let prev = new Int32Array(n + 1);
  let cur = new Int32Array(n + 1);
  for (let j = 0; j <= n; j++) prev[j] = j;
  for (let i = 1; i <= a.length; i++) {
    cur[0] = i;
    for (let j = 1; j <= n; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let d = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) d = Math.min(d, prev2[j - 2] + 1);
      cur[j] = d;
    }
    const t = prev2;
    prev2 = prev;
    prev = cur;
    cur = t;
  }
  return prev[n];
}

/**
 * The candidate closest to what was written, or undefined when none is close enough to be a
 * plausible slip. Case is ignored. Close enough: at most one edit in four characters (at least
 * one edit), or one is a prefix of the other with at least two characters in common
 * ("diam" -> "diameter", "inch" -> "in"). Ties go to the candidate listed first.
 */
export function closest(written: string, candidates: Iterable<string>): string | undefined {
  const w = written.toLowerCase();
  let best: string | undefined;
  let bestScore = Infinity;
  for (const c of candidates) {
    const lc = c.toLowerCase();
    if (lc === w) return c;
    const d = editDistance(w, lc);
    const allowed = Math.max(1, Math.floor(Math.max(w.length, lc.length) / 4));
    let score = d <= allowed ? d : Infinity;
    const shorter = Math.min(w.length, lc.length);
    if (shorter >= 2 && (lc.startsWith(w) || w.startsWith(lc))) score = Math.min(score, 0.5 + Math.abs(lc.length - w.length) / 100);
    if (score < bestScore) {
      bestScore = score;
      best = c;
    }
  }
  return best;
}

/** ': did you mean "x"?' or '' when nothing is close. */
export function didYouMean(written: string, candidates: Iterable<string>): string {
  const c = closest(written, candidates);
  return c === undefined ? '' : `: did you mean "${c}"?`;
}

/** '"a", "b" or "c"' */
export function quoteList(items: readonly string[], last = 'or'): string {
  const q = items.map((s) => `"${s}"`);
  if (q.length <= 1) return q.join('');
  return `${q.slice(0, -1).join(', ')} ${last} ${q[q.length - 1]}`;
}
