/**
 * Online, allocation-free robust estimates used to scale the detection thresholds.
 *
 * Noise: the standard deviation of a signal's noise is estimated from the median
 * absolute difference of consecutive samples, σ ≈ median|x_k − x_{k−1}| / (√2 · 0.6745)
 * (for Gaussian noise the difference has σ√2 and the median of |N(0, s)| is 0.6745·s;
 * a textbook fact, from memory). Differences cancel slow trends (a CV taper, a CC
 * voltage rise) and the median ignores the occasional step edge.
 *
 * Blocks of 64 values are summarised by their median; the estimate is the median
 * of the last 15 block medians, so it follows a change of noise within ~1,000 samples.
 */
const blockSize = 64;
const historySize = 15;

export class BlockMedian {
  private readonly block = new Float64Array(blockSize);
  private readonly scratch = new Float64Array(blockSize);
  private readonly history = new Float64Array(historySize);
  private readonly historyScratch = new Float64Array(historySize);
  private filled = 0;
  private blocks = 0;
  private current = NaN;

  /** Adds |a[k] − a[k−1]| (k and k−1 masked), read here so no number crosses the call. */
  addAbsDifference(a: Float64Array, k: number, mask: number): void {
    const x = (a[k & mask] ?? 0) - (a[(k - 1) & mask] ?? 0);
    this.add(x < 0 ? -x : x);
  }

  /** Adds a[k] − a[k−1] when positive (k and k−1 masked). */
  addPositiveDifference(a: Float64Array, k: number, mask: number): void {
    const x = (a[k & mask] ?? 0) - (a[(k - 1) & mask] ?? 0);
    if (x > 0) this.add(x);
  }

  add(x: number): void {
    this.block[this.filled++] = x;
    if (this.filled === blockSize) {
      this.scratch.set(this.block);
      const lo = select(this.scratch, blockSize, 31);
      const hi = minFrom(this.scratch, 32, blockSize);
      this.history[this.blocks % historySize] = 0.5 * (lo + hi);
      this.blocks += 1;
      this.filled = 0;
      const n = Math.min(this.blocks, historySize);
      for (let k = 0; k < n; k++) this.historyScratch[k] = this.history[k] ?? 0;
      this.current = median(this.historyScratch, n);
    } else if (this.blocks === 0) {
      // Before the first block is complete, use the median of what has been seen.
      for (let k = 0; k < this.filled; k++) this.scratch[k] = this.block[k] ?? 0;
      this.current = median(this.scratch, this.filled);
    }
  }

  /** NaN until a value has been added. */
  value(): number {
    return this.current;
  }

  /** Blocks completed so far (the value changes only when this does). */
  get version(): number {
    return this.blocks + (this.blocks === 0 ? this.filled : 0);
  }
}

/**
 * σ estimate of a signal's sample-to-sample noise, fed with sample k of a ring column
 * (indices, not values, cross the call so no number is boxed on the hot path).
 */
export class NoiseScale {
  private readonly med = new BlockMedian();
  constructor(private readonly mask: number) {}
  add(column: Float64Array, k: number): void {
    this.med.addAbsDifference(column, k, this.mask);
  }
  sigma(): number {
    const m = this.med.value();
    return m === m ? m / 0.9539 : 0;
  }
}

/** Median of a[0..n) (reorders a). */
function median(a: Float64Array, n: number): number {
  if (n % 2 === 1) return select(a, n, (n - 1) >> 1);
  const lo = select(a, n, n / 2 - 1);
  return 0.5 * (lo + minFrom(a, n / 2, n));
}

/** The k-th smallest of a[0..n) by Hoare's quickselect; afterwards a[k+1..n) ≥ a[k]. */
function select(a: Float64Array, n: number, k: number): number {
  let left = 0;
  let right = n - 1;
  while (right > left) {
    const pivot = a[(left + right) >> 1] ?? 0;
    let i = left;
    let j = right;
    while (i <= j) {
      while ((a[i] ?? 0) < pivot) i++;
      while ((a[j] ?? 0) > pivot) j--;
      if (i <= j) {
        const tmp = a[i] ?? 0;
        a[i] = a[j] ?? 0;
        a[j] = tmp;
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else break;
  }
  return a[k] ?? 0;
}

function minFrom(a: Float64Array, from: number, to: number): number {
  let m = Infinity;
  for (let k = from; k < to; k++) {
    const x = a[k] ?? 0;
    if (x < m) m = x;
  }
  return m;
}
