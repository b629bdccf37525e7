import { escapeHtml } from "./escape-html";
import { formatParameterValue, formatSeconds, formatTableValue } from "./format-value";
import { REPORT_CSS } from "./report-css";
import type { ReportCell, ReportModel, ReportTable } from "./report-model";
import { sanitizeHtml } from "./sanitize-html";

/**
 * Writes a study run as one self-contained HTML file: inline CSS and inline SVG, no
 * scripts, no external requests (no fonts, stylesheets or images by URL), readable on
 * screen and printed. Sections: masthead (title, about, time, core version, seed,
 * cell counts), the parameter table, every cell in order (headline, cautions in the
 * caution style, failure message, prose, figure, table), and an appendix of
 * receipts. All text is escaped; the prose HTML and figure SVG are passed through
 * the allow-list sanitiser. Pure: the same model gives the same bytes.
 */
export function renderReport(report: ReportModel): string {
  const counts = { done: 0, failed: 0, held: 0 };
  for (const cell of report.cells) counts[cell.status] = (counts[cell.status] ?? 0) + 1;
  const countWords = [`${counts.done} done`, counts.failed > 0 ? `${counts.failed} failed` : "", counts.held > 0 ? `${counts.held} held` : ""].filter(Boolean).join(" · ");

  const parts: string[] = [];
  parts.push(
    "<!DOCTYPE html>",
    `<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">`,
    `<meta name="generator" content="Couplet">`,
    `<title>${escapeHtml(report.title)}</title>`,
    `<style>${REPORT_CSS}</style></head><body><main class="cf-report">`,
  );

  parts.push(`<header class="cf-masthead"><p class="cf-kicker">Couplet study report</p><h1>${escapeHtml(report.title)}</h1>`);
  if (report.about && report.about.trim()) parts.push(`<div class="cf-about">${paragraphs(report.about)}</div>`);
  parts.push(
    `<dl class="cf-meta">`,
    meta("Run", report.generatedAt),
    meta("Core", report.coreVersion),
    meta("Seed", String(report.seed)),
    meta("Cells", countWords),
    `</dl></header>`,
  );

  parts.push(`<section class="cf-settings" aria-labelledby="cf-settings-title"><h2 class="cf-section-title" id="cf-settings-title">Settings of this run</h2>`);
  if (report.parameters.length === 0) {
    parts.push(`<p class="cf-sans">This study has no parameters.</p>`);
  } else {
    parts.push(`<div class="cf-table-wrap"><table class="cf-table cf-parameters"><thead><tr><th scope="col">Parameter</th><th scope="col" class="cf-num">Value</th><th scope="col">Control</th></tr></thead><tbody>`);
    for (const p of report.parameters) {
      parts.push(`<tr><th scope="row">${escapeHtml(p.name)}</th><td class="cf-num">${escapeHtml(formatParameterValue(p.value))}</td><td>${escapeHtml(p.control)}</td></tr>`);
    }
    parts.push(`</tbody></table></div>`);
  }
  parts.push(`</section>`);

  parts.push(`<section class="cf-cells">`);
  for (const cell of report.cells) parts.push(renderCell(cell));
  parts.push(`</section>`);

  parts.push(`<section class="cf-appendix" aria-labelledby="cf-receipts-title"><h2 class="cf-section-title" id="cf-receipts-title">Appendix: receipts</h2>`);
  parts.push(`<p>A receipt records, for each computing cell, a fingerprint of its inputs and settings, what it produced and how long it took. Re-running the study with the same seed and core version should reproduce every line.</p>`);
  if (report.receipts.length === 0) {
    parts.push(`<p>No computing cells ran.</p>`);
  } else {
    const names = new Map(report.cells.map((c) => [c.id, c.name ?? c.id]));
    parts.push(`<div class="cf-table-wrap"><table class="cf-table cf-receipts"><thead><tr><th scope="col">Cell</th><th scope="col">Fingerprint</th><th scope="col">Result</th><th scope="col" class="cf-num">Time</th></tr></thead><tbody>`);
    for (const r of report.receipts) {
      const label = escapeHtml(names.get(r.cellId) ?? r.cellId);
      const cellRef = names.has(r.cellId) ? `<a href="#${escapeHtml(cellAnchor(r.cellId))}">${label}</a>` : label;
      parts.push(`<tr><td>${cellRef}</td><td class="cf-mono">${escapeHtml(r.fingerprint)}</td><td>${escapeHtml(r.summary)}</td><td class="cf-num">${escapeHtml(formatSeconds(r.seconds))}</td></tr>`);
    }
    parts.push(`</tbody></table></div>`);
  }
  parts.push(`</section>`);

  parts.push(
    `<footer class="cf-footer">Written by Couplet (core ${escapeHtml(report.coreVersion)}) on ${escapeHtml(report.generatedAt)}. This file is self-contained: it runs no scripts and loads nothing from the network.</footer>`,
    `</main></body></html>`,
  );
  return parts.join("\n");
}

function meta(term: string, value: string): string {
  return `<div><dt>${escapeHtml(term)}</dt><dd>${escapeHtml(value)}</dd></div>`;
}

/** Plain text with blank-line paragraph breaks → escaped paragraphs. */
function paragraphs(text: string): string {
  return text
    .split(/\n\s*\n/)
    .map((p) => p.trim())
    .filter(Boolean)
    .map((p) => `<p>${escapeHtml(p)}</p>`)
    .join("");
}

/** Anchor id of a cell: `cell-` plus the id with anything outside [A-Za-z0-9_-] replaced. */
function cellAnchor(id: string): string {
  return `cell-${id.replace(/[^A-Za-z0-9_-]/g, "_")}`;
}

function renderCell(cell: ReportCell): string {
  const status = cell.status === "failed" || cell.status === "held" ? cell.status : "done";
  const quiet = cell.kind === "prose" && status === "done" && cell.cautions.length === 0;
  const out: string[] = [`<article class="cf-cell cf-kind-${escapeHtml(cell.kind.replace(/[^A-Za-z0-9_-]/g, "_"))} cf-cell-${status}" id="${escapeHtml(cellAnchor(cell.id))}">`];
  if (!quiet) {
    out.push(
      `<header class="cf-cell-head"><span class="cf-cell-kind">${escapeHtml(cell.kind)}</span>`,
      `<h2>${escapeHtml(cell.name ?? cell.id)}</h2>`,
      cell.seconds !== undefined ? `<span class="cf-cell-time">${escapeHtml(formatSeconds(cell.seconds))}</span>` : "",
      `<span class="cf-status cf-status-${status}">${status}</span></header>`,
    );
  }
  if (cell.headline) out.push(`<p class="cf-headline">${escapeHtml(cell.headline)}</p>`);
  if (cell.cautions.length > 0) {
    out.push(`<div class="cf-cautions" role="note"><p class="cf-caution-label">${cell.cautions.length === 1 ? "Caution" : "Cautions"}</p><ul>`);
    for (const c of cell.cautions) out.push(`<li>${escapeHtml(c)}</li>`);
    out.push(`</ul></div>`);
  }
  if (status === "failed") {
    out.push(`<div class="cf-error" role="alert"><p class="cf-error-label">This cell failed</p><pre>${escapeHtml(cell.error ?? "no message was recorded")}</pre></div>`);
  } else if (status === "held") {
    out.push(`<p class="cf-held">Held: not computed in this run${cell.error ? ` (${escapeHtml(cell.error)})` : ""}.</p>`);
  }
  if (cell.html) out.push(`<div class="cf-prose">${sanitizeHtml(cell.html, { svg: false })}</div>`);
  if (cell.svg) out.push(`<div class="cf-cell-output">${sanitizeHtml(cell.svg)}</div>`);
  if (cell.table) out.push(renderTable(cell.table));
  out.push(`</article>`);
  return out.filter(Boolean).join("");
}

function renderTable(table: ReportTable): string {
  const { columns, rows, formats = [], caption } = table;
  const numeric = columns.map((_, c) => formats[c] !== "text" && rows.some((r) => typeof r[c] === "number"));
  const out = [`<div class="cf-table-wrap"><table class="cf-table">`];
  if (caption) out.push(`<caption>${escapeHtml(caption)}</caption>`);
  out.push(`<thead><tr>${columns.map((c, k) => `<th scope="col"${numeric[k] ? ` class="cf-num"` : ""}>${escapeHtml(c)}</th>`).join("")}</tr></thead><tbody>`);
  for (const row of rows) {
    out.push(
      `<tr>${columns
        .map((_, k) => {
          const v = k < row.length ? row[k] : null;
          return `<td${numeric[k] ? ` class="cf-num"` : ""}>${escapeHtml(formatTableValue(v, formats[k]))}</td>`;
        })
        .join("")}</tr>`,
    );
  }
  out.push(`</tbody></table></div>`);
  return out.join("");
}
