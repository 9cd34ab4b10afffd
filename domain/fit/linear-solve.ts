/** Gaussian elimination with partial pivoting (Gauss–Jordan form); undefined when singular. */
export function solveLinear(a: readonly (readonly number[])[], b: readonly number[]): number[] | undefined {
  const n = b.length;
  const m = a.map((row, i) => [...row, b[i] ?? 0]);
  for (let c = 0; c < n; c += 1) {
    let piv = c;
    for (let r = c + 1; r < n; r += 1) {
      if (Math.abs(m[r]?.[c] ?? 0) > Math.abs(m[piv]?.[c] ?? 0)) piv = r;
    }
    const pr = m[piv];
    const cr = m[c];
    if (pr === undefined || cr === undefined || Math.abs(pr[c] ?? 0) < 1e-300) return undefined;
    m[piv] = cr;
    m[c] = pr;
    for (let r = 0; r < n; r += 1) {
      const row = m[r];
      if (r === c || row === undefined) continue;
      const f = (row[c] ?? 0) / (pr[c] ?? 1);
      for (let k = c; k <= n; k += 1) row[k] = (row[k] ?? 0) - f * (pr[k] ?? 0);
    }
  }
  return m.map((row, i) => (row[n] ?? 0) / (row[i] ?? 1));
}

/** The inverse of a square matrix, column by column; undefined when singular. */
export function invertMatrix(a: readonly (readonly number[])[]): number[][] | undefined {
  const n = a.length;
  const cols: number[][] = [];
  for (let j = 0; j < n; j += 1) {
    const col = solveLinear(
      a,
      a.map((_, i) => (i === j ? 1 : 0)),
    );
    if (col === undefined) return undefined;
    cols.push(col);
  }
  return a.map((_, i) => cols.map((col) => col[i] ?? 0));
}
