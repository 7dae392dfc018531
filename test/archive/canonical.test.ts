import { describe, expect, it } from "vitest";
import { canonicalJson, CanonicalJsonError } from "../../src/archive/canonical.ts";

describe("canonicalJson", () => {
  it("sorts keys at every depth and writes no whitespace", () => {
    expect(canonicalJson({ b: 1, a: { d: [1, { z: 0, y: 1 }], c: "x" } })).toBe('{"a":{"c":"x","d":[1,{"y":1,"z":0}]},"b":1}');
    expect(canonicalJson({ b: 1, a: 2 })).toBe(canonicalJson({ a: 2, b: 1 }));
  });

  it("writes numbers in the shortest round-trip form, −0 as 0", () => {
    expect(canonicalJson([0.1, 1e-10, 1.4, -1.116714325175769, 1e21, 5e-324, -0, 0])).toBe(
      "[0.1,1e-10,1.4,-1.116714325175769,1e+21,5e-324,0,0]",
    );
    const x = 0.1 + 0.2;
    expect(JSON.parse(canonicalJson(x))).toBe(x);
  });

  it("refuses non-finite numbers and values without a JSON form", () => {
    for (const bad of [NaN, Infinity, -Infinity, { a: [1, NaN] }, undefined, [undefined], () => 1, 1n, new Map(), new Date(0)]) {
      expect(() => canonicalJson(bad), String(bad)).toThrow(CanonicalJsonError);
    }
    expect(() => canonicalJson({ a: { b: [0, NaN] } })).toThrow(/a\.b\[1\]/);
  });

  it("drops undefined properties, writes typed arrays as arrays, escapes strings like JSON", () => {
    expect(canonicalJson({ a: undefined, b: Float64Array.from([1.5, -0]) })).toBe('{"b":[1.5,0]}');
    expect(canonicalJson({ "é\n": "\"q\"" })).toBe('{"é\\n":"\\"q\\""}');
    expect(canonicalJson(null)).toBe("null");
    expect(canonicalJson(Object.assign(Object.create(null), { k: true }))).toBe('{"k":true}');
  });

  it("refuses cycles but accepts shared (non-cyclic) references", () => {
    const shared = { x: 1 };
    expect(canonicalJson({ a: shared, b: shared })).toBe('{"a":{"x":1},"b":{"x":1}}');
    const cyc: Record<string, unknown> = {};
    cyc.self = cyc;
    expect(() => canonicalJson(cyc)).toThrow(/circular/);
  });
});
