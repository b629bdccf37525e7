// Runs before every test file: state that Couplet keeps per user (the trust list)
// goes to a fresh temporary folder, so tests never read or write the user's own.
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

process.env.COUPLET_TRUST_FILE = join(mkdtempSync(join(tmpdir(), "couplet-user-")), "trusted-studies.json");
