import { marked } from "marked";
import { describe, expect, it } from "vitest";
import { INLINE_VALUE_PATTERN, renderMarkdown } from "../../../../cells/views/report/render-markdown";

describe("renderMarkdown", () => {
  it("renderMarkdown(text, inlineValue) replaces {{ name }} by the escaped formatted value", () => {
    const html = renderMarkdown("The divergence is {{ shift.value }} at ε = {{epsilon}}.", (name) => (name === "epsilon" ? "0.05" : "<b>0.41</b>"));
    expect(html).toBe(
      '<p>The divergence is <span class="cf-value" data-name="shift.value">&lt;b&gt;0.41&lt;/b&gt;</span> at ε = <span class="cf-value" data-name="epsilon">0.05</span>.</p>\n',
    );
  });

  it("renderMarkdown(text) leaves {{ name }} inside code as written and calls inlineValue in document order", () => {
    const seen: string[] = [];
    const html = renderMarkdown("`{{ a }}` then {{ b }} and {{ c }}\n\n```\n{{ d }}\n```", (name) => (seen.push(name), name.toUpperCase()));
    expect(seen).toEqual(["b", "c"]);
    expect(html).toContain("<code>{{ a }}</code>");
    expect(html).toContain("<pre><code>{{ d }}\n</code></pre>");
  });

  it("INLINE_VALUE_PATTERN matches identifiers and dotted paths, not numbers or empty braces", () => {
    const name = (s: string) => INLINE_VALUE_PATTERN.exec(s)?.[1];
    expect(name("{{x}}")).toBe("x");
    expect(name("{{  shift.value  }}")).toBe("shift.value");
    expect(name("{{ $tmp_1 }}")).toBe("$tmp_1");
    expect(name("{{ 1x }}")).toBeUndefined();
    expect(name("{{ }}")).toBeUndefined();
    expect(name("{{ a. }}")).toBeUndefined();
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
    renderMarkdown("{{ a }}", () => "A");
    expect(marked.parse("{{ a }}", { async: false })).toBe("<p>{{ a }}</p>\n");
  });
});
