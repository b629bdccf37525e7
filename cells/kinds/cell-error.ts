/**
 * A cell's settings resolved to a value it cannot use: a number reference giving
 * a value out of bounds, an input of the wrong shape (a transport whose source is
 * not a measure), a sweep over a setting its transport does not use. The message
 * starts with the setting's path and says what was found, like the document's own
 * messages (`epsilon.relative (from eps): must be > 0, got -1`).
 */
export class CellSettingError extends Error {
  /** Dotted path of the setting inside the cell's settings, e.g. "epsilon.relative". */
  readonly setting: string;
  constructor(setting: string, message: string) {
    super(`${setting}: ${message}`);
    this.name = "CellSettingError";
    this.setting = setting;
  }
}

/**
 * Thrown instead of running a code cell (or a figure drawn by code) when the study
 * is run with code held: the study is not trusted, so its JavaScript is not run.
 * A run reports such cells, and the cells that depend on them, as "held".
 */
export class CellHeldError extends Error {
  constructor(what = "code") {
    super(`${what} not run: the study was run with code held (not trusted)`);
    this.name = "CellHeldError";
  }
}
