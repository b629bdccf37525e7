import { describe, expect, it } from "vitest";
import { errorFromPortable, portableCopy, portableError, transferList } from "../../../cells/runtime/solve-protocol";
import { TransportInputError } from "../../../core/errors";

// Structured clone and transfer follow the HTML Standard (WHATWG, "Safe passing of
// structured data"): each buffer may be listed for transfer once, and a transferred
// buffer is detached from the sender. The helpers here prepare messages for it.
describe("solve-protocol", () => {
  it("portableCopy(value) copies each typed array into a compact buffer of its own and lists it for transfer", () => {
    const big = new Float64Array([1, 2, 3, 4, 5]);
    const view = big.subarray(1, 3);
    const { value, transfer } = portableCopy({ points: view, nested: [{ mass: new Int32Array([7]) }], name: "x", n: 2 });
    expect(value.points).not.toBe(view);
    expect([...value.points]).toEqual([2, 3]);
    expect(value.points.buffer.byteLength).toBe(16); // not the 40-byte buffer of `big`
    expect(transfer).toEqual([value.points.buffer, value.nested[0].mass.buffer]);
    expect(value).toMatchObject({ name: "x", n: 2 });
  });

  it("portableCopy(value) leaves views on shared memory shared and unlisted", () => {
    const shared = new Int32Array(new SharedArrayBuffer(8));
    const { value, transfer } = portableCopy({ shared });
    expect(value.shared).toBe(shared);
    expect(transfer).toEqual([]);
  });

  it("portableCopy(value) throws a TypeError naming the path of a function or an AbortSignal", () => {
    expect(() => portableCopy({ options: { onProgress: () => {} } })).toThrow(/request\.options\.onProgress: a function cannot be sent/);
    expect(() => portableCopy({ options: { signal: new AbortController().signal } })).toThrow(/request\.options\.signal: an AbortSignal/);
  });

  it("transferList(value) lists each distinct buffer once, even when several views share it", () => {
    const both = new Float64Array(6);
    const list = transferList({ f: both.subarray(0, 3), g: both.subarray(3), plan: { from: new Int32Array(2) }, again: both });
    expect(list).toHaveLength(2);
    expect(list[0]).toBe(both.buffer);
  });

  it("transferList(value) can be posted: cloning with it detaches the buffers on the sending side", () => {
    const result = { f: new Float64Array([1, 2]) };
    const received = structuredClone(result, { transfer: transferList(result) });
    expect([...received.f]).toEqual([1, 2]);
    expect(result.f.byteLength).toBe(0); // detached
  });

  it("errorFromPortable(portableError(e)) rebuilds a TransportInputError with its field, value and message", () => {
    const original = new TransportInputError("source.mass[2]", "mass must be >= 0, got -1", -1);
    const rebuilt = errorFromPortable(structuredClone(portableError(original)));
    expect(rebuilt).toBeInstanceOf(TransportInputError);
    expect(rebuilt).toMatchObject({ field: "source.mass[2]", value: -1, message: "source.mass[2]: mass must be >= 0, got -1" });
  });

  it("errorFromPortable(portableError(e)) keeps the name and message of other errors", () => {
    const rebuilt = errorFromPortable(structuredClone(portableError(new RangeError("too big"))));
    expect(rebuilt).toMatchObject({ name: "RangeError", message: "too big" });
    expect(errorFromPortable(portableError("a string"))).toMatchObject({ name: "Error", message: "a string" });
  });
});
