/** tilth's version, written into every output's provenance. Keep in step with package.json. */
export const VERSION = '0.1.0';
