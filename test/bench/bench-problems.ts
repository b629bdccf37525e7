import { costMatrix } from "../../core/cost";
import type { Matrix } from "../../core/matrix";
import { pointMeasure } from "../../core/measure";
import { type RandomSource, seededRandom } from "../../core/random";

/** One generated transport problem: source masses a (n), target masses b (m), cost C (n×m, row-major). */
export interface BenchProblem {
  /** Names the data, so cases built on the same data share one set of files. */
  readonly key: string;
  readonly a: Float64Array;
  readonly b: Float64Array;
  readonly C: Matrix;
  /** Largest entry of C, the scale relative epsilons multiply. */
  readonly maxCost: number;
}

/** How the masses of a problem are drawn. */
export type MassKind = "uniform" | "random";

/**
 * Two clouds of n and m points drawn uniformly in the unit square [0, 1]², squared
 * Euclidean cost (|x − y|², no ½), masses uniform 1/n or random. Seeded: the source
 * draws 2n coordinates then the target 2m from seededRandom(seed), then the masses
 * (n then m values 0.1 + U[0, 1), each side scaled to total 1) when random.
 */
export function cloudProblem(n: number, m: number, masses: MassKind, seed: number): BenchProblem {
  const random = seededRandom(seed);
  const x = uniformSquare(n, random);
  const y = uniformSquare(m, random);
  const a = masses === "uniform" ? new Float64Array(n).fill(1 / n) : randomMasses(n, random);
  const b = masses === "uniform" ? new Float64Array(m).fill(1 / m) : randomMasses(m, random);
  const source = pointMeasure(x, a, { dim: 2, name: "source" });
  const target = pointMeasure(y, b, { dim: 2, name: "target" });
  const C = costMatrix(source, target, { kind: "sqeuclidean" });
  let maxCost = 0;
  for (const v of C.data) if (v > maxCost) maxCost = v;
  return { key: `cloud-${masses}-${n}x${m}-s${seed}`, a, b, C, maxCost };
}

function uniformSquare(count: number, random: RandomSource): Float64Array {
  const points = new Float64Array(2 * count);
  for (let k = 0; k < points.length; k++) points[k] = random();
  return points;
}

function randomMasses(count: number, random: RandomSource): Float64Array {
  const w = new Float64Array(count);
  let total = 0;
  for (let i = 0; i < count; i++) {
    w[i] = 0.1 + random();
    total += w[i];
  }
  for (let i = 0; i < count; i++) w[i] /= total;
  return w;
}
