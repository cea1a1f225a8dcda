/**
 * The Wald–Wolfowitz runs count about a given median written out with
 * branches, as the definition reads (Wald & Wolfowitz 1940, Ann. Math.
 * Statist. 11:147, citation from memory; points on the median left out, as
 * is common practice; a run is a maximal stretch on one side): the reference that the project's
 * branch-free count (src/core/measure/residual-tests.ts, runsTest) is held to.
 */
export function plainRuns(e: ArrayLike<number>, med: number): { runs: number; n1: number; n2: number; expected: number } {
  let n1 = 0, n2 = 0, runs = 0, last = 0;
  for (let i = 0; i < e.length; i++) {
    const v = e[i];
    const side = v > med ? 1 : v < med ? -1 : 0;
    if (side === 0) continue;
    if (side === 1) n1++; else n2++;
    if (side !== last) runs++;
    last = side;
  }
  return { runs, n1, n2, expected: n1 + n2 > 0 ? (2 * n1 * n2) / (n1 + n2) + 1 : 0 };
}
