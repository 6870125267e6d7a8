/** raiser's version, as printed by `raiser --version` and recorded in every result. */
export const TOOL_VERSION = '0.1.0';
