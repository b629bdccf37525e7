import { describe, expect, it } from "vitest";
import wabtInit from "wabt";
import { KERNEL_MAX_BYTES, KERNEL_SWEEP_WASM_HEX, KERNEL_SWEEP_WAT, kernelSweeper } from "../../core/kernel-sweep";
import { seededRandom } from "../../core/random";

describe("kernelSweeper", () => {
  it("KERNEL_SWEEP_WASM_HEX is the WebAssembly text KERNEL_SWEEP_WAT assembled by wabt", async () => {
    // The shipped bytes must come from the shipped source (wabt, the WebAssembly binary toolkit).
    const wabt = await wabtInit();
    const module = wabt.parseWat("kernel-sweep.wat", KERNEL_SWEEP_WAT, { simd: true });
    module.validate();
    const { buffer } = module.toBinary({});
    module.destroy();
    expect(Buffer.from(buffer).toString("hex")).toBe(KERNEL_SWEEP_WASM_HEX);
  });

  it("kernelSweeper(n, m, scale) computes acc = Σ_i scale(i, K_i·z)·K_i with identical bits in both backends", () => {
    // Reference: the definition, summed naively in float64; the two backends must agree bit for bit
    // (same summation order, no fused multiply-add).
    for (const [n, m] of [
      [7, 5],
      [16, 12],
      [33, 50],
    ]) {
      const r = seededRandom(n * 100 + m);
      const K = Float64Array.from({ length: n * m }, () => r());
      const z = Float64Array.from({ length: m }, () => r());
      const w = Float64Array.from({ length: n }, (_, i) => (i % 4 === 3 ? 0 : r()));
      const seen: number[][] = [];
      const results = (["js", "auto"] as const).map((backend) => {
        const t: number[] = [];
        const s = kernelSweeper(n, m, backend)!;
        for (let i = 0; i < n; i++) for (let j = 0; j < m; j++) s.K[i * s.stride + j] = K[i * m + j];
        s.z.set(z);
        s.sweep((i, dot) => {
          t[i] = dot;
          return w[i] / dot;
        });
        seen.push(t);
        return { backend: s.backend, acc: Array.from(s.acc.subarray(0, m)) };
      });
      expect(results[0].backend).toBe("js");
      expect(results[1].backend).toBe("wasm-simd");
      expect(results[1].acc).toEqual(results[0].acc);
      expect(seen[1]).toEqual(seen[0]);
      for (let j = 0; j < m; j++) {
        let expected = 0;
        for (let i = 0; i < n; i++) {
          let dot = 0;
          for (let k = 0; k < m; k++) dot += K[i * m + k] * z[k];
          expected += (w[i] / dot) * K[i * m + j];
        }
        expect(Math.abs(results[0].acc[j] - expected)).toBeLessThanOrEqual(1e-13 * expected);
      }
    }
  });

  it("kernelSweeper(...) returns null when the kernel would exceed KERNEL_MAX_BYTES", () => {
    // Our documented limit (2 GiB): the caller then uses the log domain.
    expect(kernelSweeper(1 << 16, 1 << 12)).toBeNull();
    expect(KERNEL_MAX_BYTES).toBe(2 ** 31);
  });
});
