// The software version recorded in logs and printed by --version; kept in step with package.json.
export const VERSION = '0.1.0';
