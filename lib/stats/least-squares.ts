/**
 * Linear least squares for a few columns (2–4), solved through the normal equations with Gaussian
 * elimination and partial pivoting (Golub & Van Loan, Matrix Computations, §3.4 and §5.3).
 * The knee search calls this thousands of times per curve; jstat's general QR `lstsq` gives the
 * same answers (checked in tests/stats/least-squares.test.ts) but allocates far more per call.
 * Callers scale their data to order one first, which keeps the normal equations well conditioned.
 */

export interface LeastSquaresFit {
  coefficients: number[];
  /** Residual sum of squares. */
  rss: number;
}

/** Solves the square system a·x = b in place; null when a is singular to working precision. */
function solveSquare(a: number[][], b: number[]): number[] | null {
  const k = b.length;
  for (let col = 0; col < k; col++) {
    let pivot = col;
    for (let row = col + 1; row < k; row++) {
      if (Math.abs(a[row]?.[col] ?? 0) > Math.abs(a[pivot]?.[col] ?? 0)) pivot = row;
    }
    const pivotRow = a[pivot] as number[];
    const scale = Math.max(...pivotRow.map(Math.abs));
    if (!(Math.abs(pivotRow[col] as number) > 1e-12 * scale)) return null;
    [a[col], a[pivot]] = [pivotRow, a[col] as number[]];
    [b[col], b[pivot]] = [b[pivot] as number, b[col] as number];
    const top = a[col] as number[];
    for (let row = col + 1; row < k; row++) {
      const r = a[row] as number[];
      const factor = (r[col] as number) / (top[col] as number);
      for (let c = col; c < k; c++) r[c] = (r[c] as number) - factor * (top[c] as number);
      b[row] = (b[row] as number) - factor * (b[col] as number);
    }
  }
  const x = new Array<number>(k).fill(0);
  for (let row = k - 1; row >= 0; row--) {
    const r = a[row] as number[];
    let sum = b[row] as number;
    for (let c = row + 1; c < k; c++) sum -= (r[c] as number) * (x[c] as number);
    x[row] = sum / (r[row] as number);
  }
  return x;
}

/**
 * Least-squares coefficients for y ≈ Σ coefficients[j]·columns[j]; null when the columns are
 * linearly dependent or there are fewer rows than columns.
 */
export function leastSquares(columns: readonly (readonly number[])[], y: readonly number[]): LeastSquaresFit | null {
  const k = columns.length;
  const n = y.length;
  if (k === 0 || n < k) return null;
  const ata: number[][] = [];
  const aty: number[] = [];
  for (let i = 0; i < k; i++) {
    const ci = columns[i] as readonly number[];
    const row: number[] = [];
    for (let j = 0; j < k; j++) {
      const cj = columns[j] as readonly number[];
      let s = 0;
      for (let r = 0; r < n; r++) s += (ci[r] as number) * (cj[r] as number);
      row.push(s);
    }
    ata.push(row);
    let s = 0;
    for (let r = 0; r < n; r++) s += (ci[r] as number) * (y[r] as number);
    aty.push(s);
  }
  const coefficients = solveSquare(ata, aty);
  if (!coefficients) return null;
  let rss = 0;
  for (let r = 0; r < n; r++) {
    let fitted = 0;
    for (let j = 0; j < k; j++) fitted += (coefficients[j] as number) * ((columns[j] as readonly number[])[r] as number);
    rss += ((y[r] as number) - fitted) ** 2;
  }
  return { coefficients, rss };
}
