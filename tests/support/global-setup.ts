// Database-backed tests get their server from scripts/test.mjs; pure unit tests need nothing here.
export default function setup() {}
