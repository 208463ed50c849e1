/**
 * The default agronomy tables tilth ships, as data (the bundle carries them; nothing reads a file).
 * Every entry carries `source`, marked as DEVELOPERS.md says:
 * `[published] <publication>`, `common practice`, or `from memory`. A value that no publication we found
 * gives is `missing: true`: the program then asks the user (a plan key) instead of inventing one.
 * Users print these with `tilth tables`, edit them, and pass `--tables my-tables.yaml`.
 */
import type { TablesInput } from './schema.js';
import { CROPS } from './crops.js';
import { PRODUCTS } from './products.js';
import { SEED_ROW } from './seedRow.js';
import { SOIL_TESTS } from './soilTests.js';

/** The tables in the order `tilth tables` prints them: crops, seed row, soil tests, efficiency and products. */
export const DEFAULT_TABLES: TablesInput = { crops: CROPS, ...SEED_ROW, ...SOIL_TESTS, ...PRODUCTS };
