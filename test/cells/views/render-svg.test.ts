import * as Plot from "@observablehq/plot";
import { describe, expect, it } from "vitest";
import { couplingLinesFigure } from "../../../cells/views/figures/coupling-lines";
import type { FigureSpec } from "../../../cells/views/figures/figure-spec";
import { renderSvg, roundGeometry } from "../../../cells/views/render-svg";
import { pointMeasure } from "../../../core/measure";
import { roundNumbers, failOnPlotWarnings } from "./figures/figure-helpers";

const data = [
  { x: 0.123456, y: 1 / 3, c: "a" },
  { x: 2.5, y: 2 / 3, c: "b" },
];

failOnPlotWarnings();

describe("renderSvg", () => {
  it("renderSvg(plot options) returns a standalone <svg> with the SVG namespace", () => {
    const out = renderSvg({ marks: [Plot.dot(data, { x: "x", y: "y" })] });
    expect(out.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(out.endsWith("</svg>")).toBe(true);
  });

  it("renderSvg(plot options with a legend) keeps Plot's <figure> and gives every svg inside the namespace", () => {
    const out = renderSvg({ color: { type: "quantize", range: ["#eee", "#999", "#333"], legend: true }, marks: [Plot.dot(data, { x: "x", y: "y", fill: "x" })] });
    expect(out.startsWith("<figure")).toBe(true);
    const svgs = out.match(/<svg\b[^>]*>/g) ?? [];
    expect(svgs.length).toBe(2); // legend ramp + chart
    for (const tag of svgs) expect(tag).toContain('xmlns="http://www.w3.org/2000/svg"');
  });

  it("renderSvg(figure spec) wraps the chart in our figure with title, key, notes and cautions, all escaped", () => {
    const spec = couplingLinesFigure({
      source: pointMeasure([[0, 0], [1, 1]]),
      target: pointMeasure([[0, 1], [1, 2]]),
      plan: { kind: "sparse", rows: 2, cols: 2, from: Int32Array.of(0, 1), to: Int32Array.of(0, 1), mass: Float64Array.of(0.5, 0.5) },
      title: "<script>alert(1)</script> & co",
      cautions: ['not converged "after" <5000> iterations'],
    });
    const out = renderSvg(spec);
    expect(out.startsWith('<figure class="cf-figure" data-figure="coupling-lines">')).toBe(true);
    expect(out).toContain('<p class="cf-figure-title">&lt;script&gt;alert(1)&lt;/script&gt; &amp; co</p>');
    expect(out).toContain('<p class="cf-caution"><strong>Caution</strong> not converged &quot;after&quot; &lt;5000&gt; iterations</p>');
    expect(out).toContain('<p class="cf-note">Drew 2 of 2 pairs with positive mass, carrying 100.0 % of the transported mass.</p>');
    expect(out).toContain('<span class="cf-key-item">');
    expect(out).not.toContain("<script");
    expect(out).not.toMatch(/plot-d6a7b5-figure/); // Plot's own wrapper is removed
  });

  it("renderSvg(same spec) is byte-identical across calls, whatever was drawn in between", () => {
    // A clipped mark makes Plot number a clip-path id from a module counter; renumbering must hide it.
    const clipped: Plot.PlotOptions = { marks: [Plot.dot(data, { x: "x", y: "y", clip: true })] };
    const first = renderSvg(clipped, { idPrefix: "fig" });
    renderSvg(clipped);
    renderSvg(clipped);
    const again = renderSvg(clipped, { idPrefix: "fig" });
    expect(again).toBe(first);
    expect(first).toContain('id="fig-1"');
    expect(first).toContain("url(#fig-1)");
  });

  it("renderSvg(plot) rounds geometry to 0.01 px and leaves text alone", () => {
    const out = renderSvg({ marks: [Plot.dot(data, { x: "x", y: "y" }), Plot.text(["3.14159265"], { frameAnchor: "middle" })] });
    for (const m of out.matchAll(/\s(?:cx|cy|x|y|transform|d)="([^"]*)"/g)) {
      expect(m[1]).not.toMatch(/\d\.\d{3,}/);
    }
    expect(out).toContain(">3.14159265<");
  });

  it("renderSvg(coupling figure) matches a rounded snapshot of its key and caption", () => {
    // Plot's snapshot tests compare output after rounding numbers; we do the same for the parts we write.
    const spec: FigureSpec<object> = {
      figure: "coupling-lines",
      options: { width: 100, height: 50, axis: null, marks: [] },
      key: [{ label: "source", color: "#123456", shape: "dot" }, { label: "tol", color: "#654321", shape: "dash" }],
      notes: ["n = 0.333333"],
      cautions: [],
      facts: {},
    };
    const out = roundNumbers(renderSvg(spec));
    // Plot's chart (the last svg before the caption) is left out of the snapshot.
    expect(out.replace(/<\/div><svg[^]*<\/svg><figcaption>/, "</div>[chart]<figcaption>")).toBe(
      '<figure class="cf-figure" data-figure="coupling-lines"><div class="cf-key">' +
        '<span class="cf-key-item"><svg xmlns="http://www.w3.org/2000/svg" width="14" height="10" viewBox="0 0 14 10" aria-hidden="true"><circle cx="7" cy="5" r="4" fill="#123456" /></svg>source</span>' +
        '<span class="cf-key-item"><svg xmlns="http://www.w3.org/2000/svg" width="14" height="10" viewBox="0 0 14 10" aria-hidden="true"><line x1="0" y1="5" x2="14" y2="5" stroke="#654321" stroke-width="1.5" stroke-dasharray="3,2" /></svg>tol</span>' +
        '</div>[chart]<figcaption><p class="cf-note">n = 0.3</p></figcaption></figure>',
    );
  });
});

describe("roundGeometry", () => {
  it("roundGeometry(html) rounds numbers in geometry attributes only, -0 to 0", () => {
    expect(roundGeometry('<path d="M0.123456,-0.0001L10.005,2e-7" fill-opacity="0.123456">1.23456</path>')).toBe(
      '<path d="M0.12,0L10.01,0" fill-opacity="0.123456">1.23456</path>',
    );
  });
});
