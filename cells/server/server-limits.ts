/**
 * Size and count limits of the local server. Bytes unless stated. They keep one
 * stray request from filling memory; they are documented in docs/server.md.
 */
export const SERVER_LIMITS = {
  /** Largest study text the server reads or accepts in a request body: 20 MiB. */
  studyBytes: 20 * 1024 * 1024,
  /** Largest request body of the small JSON endpoints (new, trust): 64 KiB. */
  smallBodyBytes: 64 * 1024,
  /** Largest data file served to data cells: 100 MiB. */
  dataBytes: 100 * 1024 * 1024,
  /** Longest relative path accepted, in UTF-16 code units. */
  pathLength: 1024,
  /** Folder depth searched by the file list (the root is depth 0). */
  listDepth: 6,
  /** Folder entries the file list looks at before it stops and reports `truncated`. */
  listEntries: 5000,
  /** Files the file list returns at most. */
  listFiles: 1000,
} as const;
