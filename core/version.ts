/** Version of the transport core, recorded in receipts. Bump when any solver's numbers may change. */
export const CORE_VERSION = "0.1.0";
