/**
 * Linear least squares by Householder QR (Golub & Van Loan, "Matrix
 * Computations", §5.3 — the standard stable method). QR avoids forming the
 * normal equations, whose condition number is the square of the design
 * matrix's; that is what lets the NIST StRD checks reach 9+ digits.
 *
 * The design matrix is column-major: column j occupies a[j*rows .. j*rows+rows).
 */

export interface LeastSquaresSolution {
  /** Coefficients b minimising |A b - y|². */
  coefficients: Float64Array;
  /** (AᵀA)⁻¹ = R⁻¹R⁻ᵀ, row-major cols×cols; multiply by σ² for the covariance. */
  unscaledCovariance: Float64Array;
  /** Residual sum of squares |A b - y|². */
  residualSumSquares: number;
  /** False when a column is (numerically) dependent on the others. */
  fullRank: boolean;
}

/**
 * Solves min |A b - y|² for a rows×cols column-major matrix A (rows ≥ cols).
 * A and y are overwritten (A with the Householder vectors and R, y with Qᵀy).
 */
interface Factorization {
  diagR: Float64Array;
  fullRank: boolean;
}

/**
 * Householder QR in place: A becomes the Householder vectors (below the
 * diagonal) and R (above it, diagonal in diagR); y becomes Qᵀy.
 */
function householderInPlace(a: Float64Array, rows: number, cols: number, y: Float64Array): Factorization {
  if (rows < cols) throw new RangeError(`least squares needs rows ≥ cols (got ${rows} < ${cols})`);
  const diagR = new Float64Array(cols);
  let fullRank = true;
  let maxNorm = 0;
  for (let k = 0; k < cols; k++) {
    const ck = k * rows;
    // Column norm, scaled by the largest element so squares neither overflow nor underflow.
    let big = 0;
    for (let i = k; i < rows; i++) big = Math.max(big, Math.abs(a[ck + i] as number));
    let ss = 0;
    if (big > 0) {
      for (let i = k; i < rows; i++) {
        const t = (a[ck + i] as number) / big;
        ss += t * t;
      }
    }
    const norm = big * Math.sqrt(ss);
    maxNorm = Math.max(maxNorm, norm);
    if (norm === 0 || norm <= 1e-13 * maxNorm) {
      fullRank = false;
      diagR[k] = 0;
      continue;
    }
    // Sign chosen to avoid cancellation in v[k] = a[k] - alpha.
    const akk = a[ck + k] as number;
    const alpha = akk > 0 ? -norm : norm;
    a[ck + k] = akk - alpha;
    // v = a[k..rows) now; vᵀv = 2 norm² - 2 akk alpha = -2 alpha (akk - alpha).
    const vtv = -2 * alpha * (akk - alpha);
    for (let j = k + 1; j < cols; j++) {
      const cj = j * rows;
      let dot = 0;
      for (let i = k; i < rows; i++) dot += (a[ck + i] as number) * (a[cj + i] as number);
      const f = (2 * dot) / vtv;
      for (let i = k; i < rows; i++) a[cj + i] = (a[cj + i] as number) - f * (a[ck + i] as number);
    }
    let doty = 0;
    for (let i = k; i < rows; i++) doty += (a[ck + i] as number) * (y[i] as number);
    const fy = (2 * doty) / vtv;
    for (let i = k; i < rows; i++) y[i] = (y[i] as number) - fy * (a[ck + i] as number);
    diagR[k] = alpha;
  }
  return { diagR, fullRank };
}

/**
 * Residual sum of squares of the nested models "first p columns", p = 1…cols,
 * from one factorization (Householder QR is column-ordered: its leading p×p
 * block is the QR of the first p columns). rss[p − 1]; NaN past a dependent column.
 */
export function nestedResidualSumsInPlace(a: Float64Array, rows: number, cols: number, y: Float64Array): Float64Array {
  const { diagR } = householderInPlace(a, rows, cols, y);
  const rss = new Float64Array(cols);
  let tail = 0;
  for (let i = cols; i < rows; i++) tail += (y[i] as number) * (y[i] as number);
  for (let p = cols; p >= 1; p--) {
    rss[p - 1] = tail;
    tail += (y[p - 1] as number) * (y[p - 1] as number);
  }
  for (let p = 0; p < cols; p++) if (diagR[p] === 0) for (let q = p; q < cols; q++) rss[q] = NaN;
  return rss;
}

/**
 * Solves min |A b - y|² for a rows×cols column-major matrix A (rows ≥ cols).
 * A and y are overwritten (A with the Householder vectors and R, y with Qᵀy).
 */
export function solveLeastSquaresInPlace(
  a: Float64Array,
  rows: number,
  cols: number,
  y: Float64Array,
): LeastSquaresSolution {
  const { diagR, fullRank } = householderInPlace(a, rows, cols, y);
  const { coefficients, unscaledCovariance } = solveTriangular(
    diagR,
    (i, j) => a[j * rows + i] as number,
    y,
    cols,
    fullRank,
  );
  let rss = 0;
  for (let i = cols; i < rows; i++) rss += (y[i] as number) * (y[i] as number);
  return { coefficients, unscaledCovariance, residualSumSquares: rss, fullRank };
}

/**
 * Coefficients b from R·b = (Qᵀy)[0…cols) by back substitution, and (AᵀA)⁻¹ = R⁻¹R⁻ᵀ:
 * R's diagonal in diagR, its entries above it from `above(i, j)` (i < j). All zero
 * when not of full rank. (Shared with the matrix-free quadratic, poly-fit-quadratic.ts.)
 */
export function solveTriangular(
  diagR: Float64Array,
  above: (i: number, j: number) => number,
  y: ArrayLike<number>,
  cols: number,
  fullRank: boolean,
): { coefficients: Float64Array; unscaledCovariance: Float64Array } {
  const b = new Float64Array(cols);
  const rinv = new Float64Array(cols * cols); // row-major upper-triangular R⁻¹
  if (fullRank) {
    const r = (i: number, j: number): number => (i === j ? (diagR[i] as number) : above(i, j));
    for (let i = cols - 1; i >= 0; i--) {
      let s = y[i] as number;
      for (let j = i + 1; j < cols; j++) s -= r(i, j) * (b[j] as number);
      b[i] = s / r(i, i);
    }
    // Columns of R⁻¹ by back substitution on unit vectors.
    for (let c = 0; c < cols; c++) {
      for (let i = c; i >= 0; i--) {
        let s = i === c ? 1 : 0;
        for (let j = i + 1; j <= c; j++) s -= r(i, j) * (rinv[j * cols + c] as number);
        rinv[i * cols + c] = s / r(i, i);
      }
    }
  }
  const cov = new Float64Array(cols * cols);
  for (let i = 0; i < cols; i++) {
    for (let j = i; j < cols; j++) {
      let s = 0;
      for (let k = j; k < cols; k++) s += (rinv[i * cols + k] as number) * (rinv[j * cols + k] as number);
      cov[i * cols + j] = s;
      cov[j * cols + i] = s;
    }
  }
  return { coefficients: b, unscaledCovariance: cov };
}
