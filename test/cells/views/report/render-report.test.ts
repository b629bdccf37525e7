import { writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { renderReport } from "../../../../cells/views/report/render-report";
import type { ReportModel } from "../../../../cells/views/report/report-model";
import { exampleReport } from "./example-report";

let model: ReportModel;
let html: string;
beforeAll(() => {
  model = exampleReport();
  html = renderReport(model);
  // Kept for looking at in a browser (see the report of the figures work for a screenshot).
  writeFileSync(join(tmpdir(), "couplet-report-example.html"), html);
});

const minimal: ReportModel = {
  title: "t",
  generatedAt: "2025-01-01T00:00:00Z",
  coreVersion: "0.1.0",
  seed: 1,
  parameters: [],
  cells: [],
  receipts: [],
};

describe("renderReport", () => {
  it("renderReport(model) is one HTML document with inline CSS and no script", () => {
    expect(html.startsWith("<!DOCTYPE html>\n<html lang=\"en\">")).toBe(true);
    expect(html.trimEnd().endsWith("</html>")).toBe(true);
    expect(html.match(/<style>/g)).toHaveLength(1);
    expect(html).not.toMatch(/<script/i);
    // Event handlers would be attributes inside tags (escaped hostile text outside tags is fine).
    const handlers = [...html.matchAll(/<[^>]+>/g)].filter((m) => /\son[a-z]+\s*=/i.test(m[0]));
    expect(handlers.map((m) => m[0].slice(0, 80))).toEqual([]);
  });

  it("renderReport(model) makes no external requests: no http(s) references, no url(), no @import, no <link>", () => {
    // The example has no prose links, so no http(s) string may appear at all (SVG xmlns is dropped).
    expect(html).not.toMatch(/https?:\/\//);
    expect(html).not.toMatch(/url\(\s*['"]?(?!#)/i);
    expect(html).not.toMatch(/@import|<link\b|<iframe|<object|<embed/i);
    for (const m of html.matchAll(/\ssrc="([^"]*)"/g)) expect(m[1]).toMatch(/^data:image\//);
  });

  it("renderReport(model with a prose link) keeps the link as a link, never as a resource", () => {
    const withLink = renderReport({ ...minimal, cells: [{ id: "p", kind: "prose", status: "done", html: '<p><a href="https://example.org/paper">paper</a></p>', cautions: [] }] });
    expect([...withLink.matchAll(/https?:\/\/[^"<\s]*/g)].map((m) => m[0])).toEqual(["https://example.org/paper"]);
    expect(withLink).toContain('<a href="https://example.org/paper">paper</a>');
  });

  it("renderReport(model) contains every figure as inline SVG, in cell order", () => {
    expect(html.match(/<figure class="cf-figure"/g)).toHaveLength(6);
    expect(html).toContain('aria-description="coupling line"');
    expect(html).toContain('aria-description="plan cell"');
    expect(html).toContain('aria-description="error history"');
    expect(html).toContain('aria-description="potential point"');
    expect(html).toContain('aria-description="mean curve"');
    const order = [...html.matchAll(/<article [^>]*id="cell-([^"]+)"/g)].map((m) => m[1]);
    expect(order).toEqual(model.cells.map((c) => c.id));
  });

  it("renderReport(model) shows the parameter table, headlines, prose values and formatted table values", () => {
    expect(html).toContain('<tr><th scope="row">epsilon</th><td class="cf-num">0.05</td><td>log range 0.001 – 1</td></tr>');
    expect(html).toContain('<tr><th scope="row">debias</th><td class="cf-num">on</td><td>toggle</td></tr>');
    expect(html).toContain('<p class="cf-headline">OT_ε = 1.87 (ε = 0.05 absolute; 0.031 × median cost)</p>');
    expect(html).toContain('<span class="cf-value" data-name="shift.value">0.412</span>');
    // Table formats: integer, 3 significant, scientific, percent, null as a dash.
    expect(html).toContain('<tr><td class="cf-num">25</td><td class="cf-num">0.201</td><td class="cf-num">4.31e\u22121</td><td class="cf-num">100.0 %</td></tr>');
    expect(html).toContain('<td class="cf-num">—</td>');
    expect(html).toContain("<dt>Seed</dt><dd>7</dd>");
    expect(html).toContain("<dt>Cells</dt><dd>7 done · 1 failed · 1 held</dd>");
  });

  it("renderReport(model) escapes hostile text in titles, names, parameters and errors", () => {
    expect(html).toContain("<title>Orchard probes: &lt;second pass&gt; drift &amp; &quot;shift&quot;</title>");
    expect(html).toContain('<th scope="row">label&lt;script&gt;</th><td class="cf-num">&lt;b&gt;bold&lt;/b&gt;</td>');
    expect(html).toContain("<h2>Unbalanced &lt;img src=x onerror=alert(1)&gt;</h2>");
    expect(html).toContain("<pre>massPenalty: must be &gt; 0, got -1 &lt;script&gt;alert(1)&lt;/script&gt;</pre>");
    expect(html).not.toMatch(/<img src=x/i);
  });

  it("renderReport(model) shows cautions in the caution style, failures with their message and held cells with the reason", () => {
    expect(html).toContain('<div class="cf-cautions" role="note"><p class="cf-caution-label">Caution</p><ul><li>Regularised value: not a distance (use the debiased divergence to compare).</li></ul></div>');
    expect(html).toContain('<p class="cf-error-label">This cell failed</p>');
    expect(html).toContain('<p class="cf-held">Held: not computed in this run (its input &#39;tail&#39; failed).</p>');
    expect(html).toContain('<span class="cf-status cf-status-failed">failed</span>');
  });

  it("renderReport(model) ends with a receipts appendix linking each receipt to its cell", () => {
    const appendix = html.slice(html.indexOf('class="cf-appendix"'));
    expect(appendix).toContain('<a href="#cell-shift">Entropic coupling of the two passes</a>');
    expect(appendix).toContain("sha256:3f1a9c0b7d2e4f6a8b9c0d1e2f3a4b5c6d7e8f9a0b1c2d3e4f5a6b7c8d9e0f1a");
    expect(appendix).toContain('<td class="cf-num">12.50 s</td>');
  });

  it("renderReport(same model) gives the same bytes twice", () => {
    expect(renderReport(model)).toBe(html);
  });

  it("renderReport(model with nothing) still writes a complete page saying so", () => {
    const out = renderReport(minimal);
    expect(out).toContain("This study has no parameters.");
    expect(out).toContain("No computing cells ran.");
  });
});
