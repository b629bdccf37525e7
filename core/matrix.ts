/** A dense row-major matrix: entry (i, j) is `data[i * cols + j]`. */
export interface Matrix {
  readonly data: Float64Array;
  readonly rows: number;
  readonly cols: number;
}

/** A new zero-filled rows × cols matrix. */
export function zeroMatrix(rows: number, cols: number): Matrix {
  return { data: new Float64Array(rows * cols), rows, cols };
}
