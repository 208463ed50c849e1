/** ISO 11783-10 task data (ISOXML): plain-data model, XML writer and reader, grid files. Format only. */
export * from './model.js';
export { taskDataXml, taskDataFiles } from './write.js';
export { readTaskData } from './read.js';
export { encodeInt32LE, decodeInt32LE } from './grid.js';
