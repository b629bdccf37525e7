import { marked } from "marked";
import { describe, expect, it } from "vitest";
import { splitProse } from "../../../../cells/kinds/prose/settings";
import { INLINE_VALUE_PATTERN, renderMarkdown } from "../../../../cells/views/report/render-markdown";

// The live-value syntax is the study format's own (docs/format.md, "prose"); these
// tests check that rendering follows it. Markdown rendering is marked's (GFM).
describe("renderMarkdown", () => {
  it("renderMarkdown(text, inlineValue) replaces @{name} by the escaped formatted value", () => {
    const html = renderMarkdown("The divergence is @{ shift.value } at ε = @{epsilon:3f}.", (name) => (name === "epsilon" ? "0.050" : "<b>0.41</b>"));
    expect(html).toBe(
      '<p>The divergence is <span class="cf-value" data-name="shift.value">&lt;b&gt;0.41&lt;/b&gt;</span> at ε = <span class="cf-value" data-name="epsilon">0.050</span>.</p>\n',
    );
  });

  it("renderMarkdown(text, inlineValue) hands the parsed live value (name, path, format) to the formatter", () => {
    const seen: unknown[] = [];
    renderMarkdown("@{plan.values.cost:4} and @{rows.0.cost:2e} and @{eps}", (_, live) => (seen.push({ name: live.name, path: live.path, format: live.format }), ""));
    expect(seen).toEqual([
      { name: "plan", path: ["values", "cost"], format: { digits: 4, notation: "significant" } },
      { name: "rows", path: ["0", "cost"], format: { digits: 2, notation: "scientific" } },
      { name: "eps", path: [], format: undefined },
    ]);
  });

  it("renderMarkdown(text) fills live values inside code too, in document order, as the format says", () => {
    const seen: string[] = [];
    const html = renderMarkdown("`@{a}` then @{b} and @{c}\n\n```\n@{d}\n```", (name) => (seen.push(name), name.toUpperCase()));
    expect(seen).toEqual(["a", "b", "c", "d"]);
    expect(html).toContain('<code><span class="cf-value" data-name="a">A</span></code>');
    expect(html).toContain('<pre><code><span class="cf-value" data-name="d">D</span>\n</code></pre>');
  });

  it("renderMarkdown(text) writes an escaped \\@{name} and a malformed live value as text", () => {
    const html = renderMarkdown("escaped \\@{eps} and broken @{3x} stay", () => "X");
    expect(html).toBe("<p>escaped @{eps} and broken @{3x} stay</p>\n");
  });

  it("renderMarkdown(text) puts a live value inside a link target as escaped text, without a span", () => {
    const html = renderMarkdown("[report](https://example.org/@{page})", () => "a b");
    expect(html).toContain('href="https://example.org/a%20b"');
    expect(html).not.toContain("cf-value");
  });

  it("INLINE_VALUE_PATTERN matches what splitProse reads as a live value", () => {
    const reference = (s: string) => INLINE_VALUE_PATTERN.exec(s)?.[1];
    const cases = ["@{x}", "@{  shift.value  }", "@{ $tmp_1 }", "@{ε:3f}", "@{rows.0.cost:4}", "@{ 1x }", "@{ }", "@{ a. }", "@{a:x}"];
    for (const text of cases) {
      const parsed = splitProse(text).segments.find((s) => s.kind === "value");
      const expected = parsed?.kind === "value" ? [parsed.value.name, ...parsed.value.path].join(".") : undefined;
      expect(reference(text), text).toBe(expected);
    }
  });

  it("renderMarkdown(GFM) renders tables and task lists with read-only checkboxes", () => {
    const html = renderMarkdown("| k | v |\n|:-:|--:|\n| a | 1 |\n\n- [x] done\n- [ ] open", () => "");
    expect(html).toContain('<th align="center">k</th>');
    expect(html).toContain('<td align="right">1</td>');
    expect(html).toContain('<li><input checked="" type="checkbox" disabled=""> done</li>');
    expect(html).toContain('<li><input type="checkbox" disabled=""> open</li>');
  });

  it("renderMarkdown(hostile prose) drops scripts, handlers, javascript: links and remote images", () => {
    const html = renderMarkdown(
      "[x](javascript:alert(1)) ![pic](https://xss.example/p.png) <img src=x onerror=alert(1)>\n\n<script>alert(1)</script>\n\n<a href=\"jav&#x09;ascript:alert(1)\">t</a>",
      () => "",
    );
    expect(html).not.toMatch(/<script|onerror|javascript:|https:\/\/xss/i);
    expect(html).toContain('<span class="cf-image-omitted">[image: pic]</span>');
  });

  it("renderMarkdown(text) leaves marked's global configuration untouched", () => {
    renderMarkdown("@{a}", () => "A");
    expect(marked.parse("@{a}", { async: false })).toBe("<p>@{a}</p>\n");
  });
});
