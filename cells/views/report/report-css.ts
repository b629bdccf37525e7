import { CAUTION, FAILURE, FONT_MONO, FONT_PROSE, FONT_SANS, INK, MUTED, PAPER, RULE, SOURCE_COLOR } from "../theme";

/**
 * The report's whole stylesheet, inlined into its `<head>`. It also styles the
 * figure fragments from renderSvg (the sanitiser drops Plot's own `<style>` blocks,
 * so the few rules they carried are repeated here). No `url(`, no `@import`, no web
 * fonts: the page makes no requests.
 */
export const REPORT_CSS = `
:root { color-scheme: light; }
* { box-sizing: border-box; }
html { background: ${PAPER}; color: ${INK}; }
body { margin: 0; font: 17px/1.55 ${FONT_PROSE}; -webkit-text-size-adjust: 100%; }
.cf-report { max-width: 46rem; margin: 0 auto; padding: 2.5rem 1.25rem 4rem; }
h1, h2, h3, h4, .cf-sans { font-family: ${FONT_SANS}; line-height: 1.25; }
h1 { font-size: 1.9rem; font-weight: 650; margin: 0.2rem 0 0.6rem; letter-spacing: -0.01em; }
h2 { font-size: 1.2rem; font-weight: 650; margin: 0; }
a { color: ${SOURCE_COLOR}; }
code, pre, kbd, samp { font-family: ${FONT_MONO}; font-size: 0.86em; }
pre { background: #f2efe8; padding: 0.7rem 0.9rem; overflow-x: auto; border-radius: 3px; line-height: 1.4; }
:not(pre) > code { background: #f2efe8; padding: 0.05em 0.3em; border-radius: 3px; }
blockquote { margin: 1rem 0; padding: 0 1rem; border-left: 3px solid ${RULE}; color: ${MUTED}; }
hr { border: 0; border-top: 1px solid ${RULE}; margin: 2rem 0; }

.cf-masthead { border-bottom: 2px solid ${INK}; padding-bottom: 1.1rem; margin-bottom: 2rem; }
.cf-kicker { font: 600 0.72rem/1 ${FONT_SANS}; letter-spacing: 0.14em; text-transform: uppercase; color: ${MUTED}; margin: 0; }
.cf-about p { margin: 0.4rem 0; }
.cf-meta { display: flex; flex-wrap: wrap; gap: 0.3rem 1.6rem; margin: 1rem 0 0; font: 0.8rem/1.4 ${FONT_SANS}; color: ${MUTED}; }
.cf-meta div { display: flex; gap: 0.4rem; }
.cf-meta dt { font-weight: 600; color: ${INK}; }
.cf-meta dd { margin: 0; font-variant-numeric: tabular-nums; }

.cf-section-title { font: 600 0.78rem/1 ${FONT_SANS}; letter-spacing: 0.12em; text-transform: uppercase; color: ${MUTED}; margin: 0 0 0.7rem; }
.cf-settings { margin-bottom: 2.4rem; }

.cf-table { border-collapse: collapse; width: 100%; font: 0.82rem/1.4 ${FONT_SANS}; font-variant-numeric: tabular-nums; }
.cf-table th, .cf-table td { text-align: left; padding: 0.32rem 0.7rem 0.32rem 0; border-bottom: 1px solid ${RULE}; vertical-align: top; }
.cf-table thead th { font-weight: 600; color: ${MUTED}; border-bottom: 1px solid ${INK}; }
.cf-table td.cf-num, .cf-table th.cf-num { text-align: right; }
.cf-table caption { caption-side: bottom; text-align: left; color: ${MUTED}; padding-top: 0.4rem; font-size: 0.78rem; }
.cf-table-wrap { overflow-x: auto; margin: 0.8rem 0; }
.cf-receipts td.cf-num { white-space: nowrap; }
.cf-mono { font-family: ${FONT_MONO}; font-size: 0.76rem; word-break: break-all; }

.cf-cell { margin: 0 0 2.2rem; }
.cf-cell-head { display: flex; flex-wrap: wrap; align-items: baseline; gap: 0.2rem 0.7rem; border-top: 1px solid ${RULE}; padding-top: 0.7rem; margin-bottom: 0.5rem; }
.cf-cell-kind { font: 600 0.68rem/1 ${FONT_SANS}; letter-spacing: 0.1em; text-transform: uppercase; color: ${MUTED}; }
.cf-cell-head h2 { flex: 1 1 auto; }
.cf-cell-time { font: 0.75rem/1 ${FONT_SANS}; color: ${MUTED}; font-variant-numeric: tabular-nums; }
.cf-status { font: 600 0.68rem/1 ${FONT_SANS}; letter-spacing: 0.06em; text-transform: uppercase; padding: 0.22rem 0.45rem; border-radius: 2px; border: 1px solid currentColor; }
.cf-status-done { color: #4d7a3a; }
.cf-status-failed { color: ${FAILURE.rule}; }
.cf-status-held { color: ${MUTED}; }
.cf-headline { font: 600 1.06rem/1.45 ${FONT_SANS}; font-variant-numeric: tabular-nums; margin: 0.3rem 0 0.7rem; }
.cf-prose > :first-child { margin-top: 0; }
.cf-value { font-family: ${FONT_SANS}; font-weight: 600; font-variant-numeric: tabular-nums; white-space: nowrap; }
.cf-image-omitted { color: ${MUTED}; font-style: italic; }

.cf-cautions { background: ${CAUTION.wash}; border-left: 4px solid ${CAUTION.rule}; color: ${CAUTION.ink}; padding: 0.5rem 0.8rem; margin: 0.6rem 0 0.9rem; font: 0.86rem/1.45 ${FONT_SANS}; }
.cf-cautions ul { margin: 0.15rem 0 0; padding-left: 1.1rem; }
.cf-caution-label, .cf-error-label { font-weight: 700; margin: 0; letter-spacing: 0.02em; }
.cf-error { background: ${FAILURE.wash}; border-left: 4px solid ${FAILURE.rule}; color: ${FAILURE.ink}; padding: 0.55rem 0.8rem; margin: 0.6rem 0; font: 0.86rem/1.45 ${FONT_SANS}; }
.cf-error pre { background: transparent; padding: 0; margin: 0.3rem 0 0; white-space: pre-wrap; color: inherit; }
.cf-held { color: ${MUTED}; font: italic 0.9rem/1.45 ${FONT_SANS}; border-left: 4px solid ${RULE}; padding: 0.3rem 0.8rem; margin: 0.6rem 0; }

.cf-figure { margin: 0.8rem 0 1rem; }
.cf-cell-output figure { margin: 0.8rem 0 1rem; }
.cf-cell-output svg { display: block; height: auto; max-width: 100%; overflow: visible; }
.cf-cell-output span > svg { display: inline-block; vertical-align: middle; margin-right: 0.35em; }
.cf-cell-output svg text, .cf-cell-output svg tspan { white-space: pre; }
.cf-figure-title { font: 600 0.95rem/1.3 ${FONT_SANS}; margin: 0 0 0.3rem; }
.cf-key { display: flex; flex-wrap: wrap; gap: 0.2rem 1.1rem; font: 0.78rem/1.3 ${FONT_SANS}; color: ${MUTED}; margin: 0.2rem 0 0.4rem; }
.cf-key-item { display: inline-flex; align-items: center; gap: 0.35rem; }
.cf-figure figcaption { font: 0.8rem/1.45 ${FONT_SANS}; color: ${MUTED}; margin-top: 0.4rem; }
.cf-figure figcaption p { margin: 0.15rem 0; }
.cf-figure .cf-caution { color: ${CAUTION.ink}; background: ${CAUTION.wash}; border-left: 3px solid ${CAUTION.rule}; padding: 0.2rem 0.6rem; margin-top: 0.35rem; }

.cf-appendix { margin-top: 3rem; border-top: 2px solid ${INK}; padding-top: 1rem; }
.cf-appendix p { font: 0.84rem/1.5 ${FONT_SANS}; color: ${MUTED}; margin: 0 0 0.8rem; }
.cf-footer { margin-top: 2.5rem; font: 0.75rem/1.5 ${FONT_SANS}; color: ${MUTED}; }

@media print {
  @page { margin: 16mm 14mm; }
  html { background: #fff; }
  body { font-size: 10.5pt; }
  .cf-report { max-width: none; padding: 0; }
  .cf-cell-head, .cf-figure-title, .cf-section-title { break-after: avoid; }
  /* A cell that fits on a page starts on a new page rather than leaving its heading behind. */
  .cf-cell, .cf-figure, .cf-cautions, .cf-error, .cf-table-wrap, tr { break-inside: avoid; }
  .cf-cautions, .cf-error, .cf-figure .cf-caution, pre, code { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
  a { color: inherit; }
  .cf-table-wrap { overflow: visible; }
}
`;
