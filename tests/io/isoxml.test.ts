/**
 * Reading task data: bad input is a UserError (exit 2) naming the element and the fix; no entity is
 * ever expanded or resolved. The attacks are the classic ones (OWASP XML External Entity Prevention
 * Cheat Sheet: "billion laughs" expansion, SYSTEM entities pointing at local files).
 */
import { describe, expect, it } from 'vitest';
import { readTaskData, taskDataFiles, type TaskData } from '../../src/io/isoxml/index.js';
import { sample, sq } from '../helpers/taskdata.js';
import { parseXml, writeXml, el } from '../../src/io/isoxml/xml.js';
import { layersFromTaskData, layersFromTaskDataFiles } from '../../src/check/taskdata.js';
import { zipFiles } from '../../src/io/zip.js';
import { userErrorMessage as userError } from '../helpers/errors.js';

const xmlOf = (td: TaskData) => new TextDecoder().decode(taskDataFiles(td)['TASKDATA.XML']);
const enc = (s: string) => new TextEncoder().encode(s);
describe('readTaskData', () => {
  it('round-trips what the writer wrote (names with markup characters included)', () => {
    const td = sample();
    td.customers[0].name = `A & B <c> "d" 'e'`;
    const back = readTaskData({ 'TASKDATA.XML': enc(xmlOf(td)) });
    expect(back.customers[0].name).toBe(`A & B <c> "d" 'e'`);
    expect(back.tasks[0].zones.map((z) => z.values[0].value)).toEqual([0, 11209, 5604]);
    expect(Array.from(back.tasks[0].zones[1].polygons[0].exterior)).toEqual(Array.from(sq(-106, 52, 0.001)));
  });

  it('layers per task and product, rates in kg/ha from DDI 6 (mg/m2 / 100, ISO 11783-11)', () => {
    const layers = layersFromTaskData(readTaskData({ 'TASKDATA.XML': enc(xmlOf(sample())) }), 'TASKDATA.XML');
    expect(layers.length).toBe(1);
    expect(layers[0].features.map((f) => f.properties!.rate_kgha)).toEqual([112.09, 56.04]);
  });

  it('a type-2 grid: runs of equal values become zones, cells with no product are left out', () => {
    const td = sample(true);
    const files = taskDataFiles(td);
    const layers = layersFromTaskData(readTaskData(files), 'TASKDATA.XML');
    expect(layers[0].features.map((f) => f.properties!.rate_kgha).sort()).toEqual([1, 2, 3]);
    // the south-west cell (first in the file: rows run south to north) holds 100 mg/m2
    const sw = layers[0].features.find((f) => f.properties!.rate_kgha === 1)!.geometry as any;
    const xs = sw.coordinates[0][0].map((p: number[]) => p[0]),
      ys = sw.coordinates[0][0].map((p: number[]) => p[1]);
    expect([Math.min(...xs), Math.min(...ys)]).toEqual([-106, 52]);
    expect(Math.max(...ys)).toBeCloseTo(52.001, 9);
  });

  it('a missing grid file names the GRD and the file', () => {
    const files = taskDataFiles(sample(true));
    delete files['GRD00001.bin'];
    expect(userError(() => readTaskData(files))).toMatch(
      /TSK TSK1.*GRD.*GRD00001\.BIN is missing.*Fix: copy GRD00001\.BIN/,
    );
  });

  it('a grid file of the wrong size (cut short) is refused', () => {
    const files = taskDataFiles(sample(true));
    files['GRD00001.bin'] = files['GRD00001.bin'].slice(0, 10);
    expect(userError(() => readTaskData(files))).toMatch(/has 10 bytes.*need 16/);
  });

  it('a zone code no TZN defines is refused, naming the task and attribute', () => {
    const td = sample();
    td.tasks[0].outOfFieldZone = 9;
    expect(userError(() => readTaskData({ 'TASKDATA.XML': enc(xmlOf(td)) }))).toMatch(
      /TSK TSK1.*out-of-field zone code \(attribute J\) is 9.*Fix: add a TZN with code 9/,
    );
  });

  it('an unknown DDI is refused by the check, naming the TZN and PDV meaning', () => {
    const td = sample();
    td.tasks[0].zones[1].values[0].ddi = 0x10;
    const read = readTaskData({ 'TASKDATA.XML': enc(xmlOf(td)) });
    expect(userError(() => layersFromTaskData(read, 'TASKDATA.XML'))).toMatch(
      /TSK TSK1 > TZN code 1: process data DDI 0010 \(16\) is not a setpoint rate.*DDI 1.*DDI 6/,
    );
  });

  it('a truncated file is refused with its line and column', () => {
    const text = xmlOf(sample());
    expect(
      userError(() => readTaskData({ 'TASKDATA.XML': enc(text.slice(0, Math.floor(text.length * 0.6))) })),
    ).toMatch(
      /line \d+: not well-formed XML: the file ends before its root element ISO11783_TaskData is closed.*cut short/,
    );
    // an element closed wrongly inside a complete file: line and column from the validator
    expect(userError(() => parseXml('<R>\n <A x="1">\n</R>', 'T.XML'))).toMatch(
      /T\.XML line 3, column \d+: not well-formed XML: .*'A'/,
    );
  });

  it('entity expansion and external entities are refused before anything is expanded or read', () => {
    const laughs = `<?xml version="1.0"?>\n<!DOCTYPE r [<!ENTITY a "aaaaaaaaaa"><!ENTITY b "&a;&a;&a;&a;&a;&a;&a;&a;&a;&a;"><!ENTITY c "&b;&b;&b;&b;&b;&b;&b;&b;&b;&b;">]>\n<ISO11783_TaskData VersionMajor="4" VersionMinor="3"><CTR A="CTR1" B="&c;"/></ISO11783_TaskData>`;
    expect(userError(() => parseXml(laughs, 'TASKDATA.XML'))).toMatch(
      /line 2: has a DOCTYPE or ENTITY declaration/,
    );
    const xxe = `<?xml version="1.0"?><!DOCTYPE r [<!ENTITY x SYSTEM "file:///etc/hostname">]><ISO11783_TaskData><CTR A="CTR1" B="&x;"/></ISO11783_TaskData>`;
    expect(userError(() => parseXml(xxe, 'TASKDATA.XML'))).toMatch(/DOCTYPE/);
    // an entity used without a declaration is refused too (never looked up anywhere)
    expect(
      userError(() => parseXml('<ISO11783_TaskData><CTR A="CTR1" B="&x;"/></ISO11783_TaskData>', 'T.XML')),
    ).toMatch(/CTR attribute B uses the entity "&x;"/);
  });

  it('character references and the predefined entities are decoded', () => {
    const e = parseXml('<R A="&#233;&#xE9;&amp;&lt;"/>', 'x');
    expect(e.attrs.A).toBe('éé&<');
    expect(parseXml(writeXml(el('R', { B: 'tab\there' })), 'x').attrs.B).toBe('tab here');
  });

  it('external files (XFR) are merged in; a missing one is named', () => {
    const xml = xmlOf(sample()).replace(/ <PDT [^>]*\/>\n/, ' <XFR A="PDT00001" B="1"/>\n');
    const ext =
      '<?xml version="1.0" encoding="UTF-8"?>\n<XFC>\n <PDT A="PDT1" B="urea from an external file"/>\n</XFC>\n';
    const td = readTaskData({ 'TASKDATA.XML': enc(xml), 'PDT00001.XML': enc(ext) });
    expect(td.products.map((p) => p.name)).toEqual(['urea from an external file']);
    expect(userError(() => readTaskData({ 'TASKDATA.XML': enc(xml) }))).toMatch(
      /XFR PDT00001: the external file PDT00001\.XML is missing/,
    );
  });

  it('a zip holding TASKDATA/ is read in memory', () => {
    const files = taskDataFiles(sample(true));
    const zip = zipFiles(Object.fromEntries(Object.entries(files).map(([k, v]) => [`TASKDATA/${k}`, v])));
    expect(layersFromTaskDataFiles({ 'td.zip': zip }, 'td.zip')[0].label).toMatch(
      /td\.zip:TASKDATA\/TASKDATA\.XML task TSK1/,
    );
  });
});
