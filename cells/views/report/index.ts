export { escapeHtml } from "./escape-html";
export { formatParameterValue, formatSeconds, formatTableValue } from "./format-value";
export { INLINE_VALUE_PATTERN, type InlineValueFormatter, renderMarkdown } from "./render-markdown";
export { renderReport } from "./render-report";
export { REPORT_CSS } from "./report-css";
export type { ColumnFormat, ReportCell, ReportCellStatus, ReportModel, ReportParameter, ReportReceipt, ReportTable, TableValue } from "./report-model";
export { safeLink, sanitizeHtml, type SanitizeOptions } from "./sanitize-html";
