/** Where tests/support/api-recorder.ts writes the /api/v1 answers the integration tests received. */
export const ANSWERS_DIR = ".data/api-answers";
