import { CellSettingError } from "../cell-error";

/** A mixture component with every reference resolved (see MixtureComponentSettings). */
export interface ResolvedComponent {
  readonly weight: number;
  readonly mean: readonly number[];
  readonly covariance?: readonly (readonly number[])[];
  readonly scale?: number | readonly number[];
}

/**
 * The density of a Gaussian mixture on a 1-D or 2-D grid, as a function of the
 * cell centre: Σ_k w_k · N(x; mean_k, Σ_k), with Σ_k the covariance or
 * diag(scale²) (scale default 1). Weights need not sum to 1: the grid histogram
 * is normalised afterwards. A density needs each Σ_k positive definite; a
 * singular one (a zero scale, a degenerate covariance) throws a
 * {@link CellSettingError} at `path` + `[k]` saying so.
 */
export function mixtureDensity(components: readonly ResolvedComponent[], axes: 1 | 2, path: string): (x: number, y?: number) => number {
  const terms = components.map((c, k) => {
    const at = `${path}[${k}]`;
    const S = covarianceOf(c, axes);
    if (axes === 1) {
      const v = S[0][0];
      if (!(v > 0)) throw new CellSettingError(at, `a grid density needs a positive variance, got ${v}`);
      const norm = c.weight / Math.sqrt(2 * Math.PI * v);
      const m = c.mean[0];
      return (x: number) => norm * Math.exp(-((x - m) ** 2) / (2 * v));
    }
    const [[a, b], [b2, d]] = S;
    const det = a * d - b * b2;
    if (!(a > 0) || !(det > 0)) throw new CellSettingError(at, `a grid density needs a positive definite covariance, got determinant ${det}`);
    // Inverse of [[a, b], [b, d]] is [[d, −b], [−b, a]] / det.
    const norm = c.weight / (2 * Math.PI * Math.sqrt(det));
    const [mx, my] = c.mean;
    return (x: number, y = 0) => {
      const dx = x - mx;
      const dy = y - my;
      const q = (d * dx * dx - (b + b2) * dx * dy + a * dy * dy) / det;
      return norm * Math.exp(-0.5 * q);
    };
  });
  return (x, y) => {
    let s = 0;
    for (const term of terms) s += term(x, y);
    return s;
  };
}

function covarianceOf(c: ResolvedComponent, axes: number): readonly (readonly number[])[] {
  if (c.covariance) return c.covariance;
  const scale = c.scale ?? 1;
  const s = typeof scale === "number" ? new Array<number>(axes).fill(scale) : scale;
  return s.map((v, i) => s.map((_, j) => (i === j ? v * v : 0)));
}
