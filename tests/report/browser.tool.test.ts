/**
 * The report in a real browser: Debian's Chromium driven by playwright-core.
 * Checks: no console errors, every map has its legend (and scale bar and north arrow), the zone count on the
 * page equals the input's, the page makes no network request, names render as text, the PNG rasters decode,
 * and printing (Letter and A4) keeps every map whole on its own page. Screenshots and PDFs go to
 * test-artifacts/ (gitignored): look at them.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync, existsSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Browser, type Page } from 'playwright-core';
import { parseReportInput, renderReport, type ReportInput } from '../../src/report/index.js';
import { requireTool } from '../helpers/tools.js';
import { quarterBuild, ROOT, tilth } from '../helpers/cli.js';
import { demoInput } from '../helpers/report-fixture.js';

const CHROMIUM = '/usr/bin/chromium';
const ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
];
const ART = join(ROOT, 'test-artifacts');
const EVIL = '<script>alert(1)</script>';

const have = requireTool(CHROMIUM, 'chromium');

describe.skipIf(!have)('report in Chromium', () => {
  let browser: Browser;
  // the demo's own report: `tilth build` on the sample quarter (the same command as `npm run demo`)
  const demoOut = join(ART, 'demo-build');
  const htmlPath = join(demoOut, 'report.html');
  let input: ReportInput;
  let geojsonZones = 0;
  const evilPath = join(ART, 'report-escaping.html');

  beforeAll(async () => {
    mkdirSync(ART, { recursive: true });
    const b = tilth([...quarterBuild(demoOut), '--force', '--quiet']);
    if (b.code !== 0) throw new Error(`tilth build failed: ${b.stderr}`);
    input = parseReportInput(readFileSync(join(demoOut, 'report-data.json'), 'utf8'));
    geojsonZones = JSON.parse(readFileSync(join(demoOut, 'prescription.geojson'), 'utf8')).features.length;
    const evil = demoInput();
    evil.title.field = EVIL;
    evil.title.farm = `" onmouseover="alert(2)`;
    evil.samples.ids[0] = EVIL;
    evil.zoneSets[0]!.zones[0]!.id = EVIL;
    evil.zoneSets[0]!.zones[0]!.bindingLimit = EVIL;
    evil.nutrients[0]!.label = EVIL;
    evil.charts[0]!.svg = `<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10" onload="alert(4)"><script>alert(3)</script><image href="http://example.invalid/x.png"/></svg>`;
    writeFileSync(evilPath, renderReport(evil));
    browser = await chromium.launch({ executablePath: CHROMIUM, args: ARGS, headless: true });
  });
  afterAll(async () => {
    await browser?.close();
  });

  /** Opens a file, recording console errors, dialogs and every request that is not the page or a data: URL. */
  async function open(
    path: string,
  ): Promise<{ page: Page; errors: string[]; requests: string[]; dialogs: string[] }> {
    const page = await browser.newPage({ viewport: { width: 1100, height: 1400 } });
    const errors: string[] = [];
    const requests: string[] = [];
    const dialogs: string[] = [];
    const self = pathToFileURL(path).href;
    page.on('console', (m) => {
      if (m.type() === 'error') errors.push(m.text());
    });
    page.on('pageerror', (e) => errors.push(e.message));
    page.on('dialog', (d) => {
      dialogs.push(d.message());
      void d.dismiss();
    });
    page.on('request', (r) => {
      if (r.url() !== self && !r.url().startsWith('data:')) requests.push(r.url());
    });
    await page.route('**/*', (route) => {
      const u = route.request().url();
      if (u === self || u.startsWith('data:')) return route.continue();
      requests.push(u);
      return route.abort();
    });
    await page.goto(self, { waitUntil: 'load' });
    return { page, errors, requests, dialogs };
  }

  it('opens with no console error and no network request, every map with legend, scale bar and north arrow', async () => {
    const { page, errors, requests } = await open(htmlPath);
    const maps = await page.$$eval('svg.map', (svgs) =>
      svgs.map((s) => {
        const box = s.getBoundingClientRect();
        const lg = s.querySelector('g.legend');
        const lb = lg?.getBoundingClientRect();
        return {
          id: s.getAttribute('data-map'),
          legendTitle: lg?.querySelector('.lg-title')?.textContent ?? '',
          swatches: lg?.querySelectorAll('rect, circle').length ?? 0,
          legendInside: !!lb && lb.width > 0 && lb.right <= box.right + 1 && lb.bottom <= box.bottom + 1,
          scale: !!s.querySelector('g.scalebar .sb-m') && !!s.querySelector('g.scalebar .sb-ft'),
          north: !!s.querySelector('g.north'),
        };
      }),
    );
    expect(maps.length).toBeGreaterThanOrEqual(1 + input.surfaces.length + input.response.length + 2);
    for (const m of maps) {
      expect(m.legendTitle, m.id!).not.toBe('');
      expect(m.swatches, m.id!).toBeGreaterThan(0);
      expect(m.legendInside, m.id!).toBe(true);
      expect(m.scale, m.id!).toBe(true);
      expect(m.north, m.id!).toBe(true);
    }
    // the zone count on the page equals the build's GeoJSON's
    const zones = input.zoneSets.reduce((s, z) => s + z.zones.length, 0);
    expect(zones).toBe(geojsonZones);
    expect(await page.textContent('#zone-count')).toBe(String(zones));
    expect(await page.locator('tr[data-zone]').count()).toBe(zones);
    const perRateMap = await page.$$eval('svg.map[data-kind="rate"]', (svgs) =>
      svgs.map(
        (s) =>
          new Set([...s.querySelectorAll('[data-zone-id]')].map((p) => p.getAttribute('data-zone-id'))).size,
      ),
    );
    expect(perRateMap.length).toBeGreaterThan(0);
    for (const n of perRateMap) expect(n).toBe(zones);
    // every raster decodes in Chromium (an independent PNG decoder) at its grid size
    const sizes = await page.$$eval('image.raster', async (imgs) =>
      Promise.all(
        imgs.map(async (im) => {
          const Img = (
            globalThis as unknown as {
              Image: new () => {
                src: string;
                decode(): Promise<void>;
                naturalWidth: number;
                naturalHeight: number;
              };
            }
          ).Image;
          const i = new Img();
          i.src = im.getAttribute('href')!;
          await i.decode();
          return [i.naturalWidth, i.naturalHeight];
        }),
      ),
    );
    expect(sizes.length).toBe(
      input.surfaces.length +
        input.response.filter((r) => r.raster).length +
        (input.chance ?? []).filter((c) => c.raster).length,
    );
    expect(sizes[0]).toEqual([input.surfaces[0]!.raster.grid.cols, input.surfaces[0]!.raster.grid.rows]);
    await page.screenshot({ path: join(ART, 'report-demo.png'), fullPage: true });
    await page
      .locator('figure.map-page')
      .nth(1)
      .screenshot({ path: join(ART, 'report-demo-map2.png') });
    expect(errors).toEqual([]);
    expect(requests).toEqual([]);
    await page.close();
  });

  it('shows names from the inputs as text: no script runs, no dialog, no request from a chart', async () => {
    const { page, errors, requests, dialogs } = await open(evilPath);
    expect(await page.locator('script').count()).toBe(0);
    expect(await page.textContent('h1')).toBe(`Fertilizer prescription: ${EVIL}`);
    expect(await page.textContent('tr[data-zone] td')).toBe(EVIL);
    expect(await page.locator('[onmouseover]').count()).toBe(0);
    expect(await page.locator('svg.map .sample-labels text').first().textContent()).toBe(EVIL);
    await page.hover('h1');
    await page.waitForTimeout(200);
    expect(dialogs).toEqual([]);
    expect(requests).toEqual([]);
    expect(errors).toEqual([]);
    await page.close();
  });

  it('prints (Letter and A4) with each map whole on one page', async () => {
    const { page } = await open(htmlPath);
    await page.emulateMedia({ media: 'print' });
    const mapCount = await page.locator('svg.map').count();
    for (const format of ['Letter', 'A4'] as const) {
      // printable area with the stylesheet's 12 mm margins: Letter 215.9 x 279.4 mm, A4 210 x 297 mm (ISO 216)
      const [wmm, hmm] = format === 'A4' ? [210, 297] : [215.9, 279.4];
      const pxPerMm = 96 / 25.4;
      await page.setViewportSize({
        width: Math.floor((wmm - 24) * pxPerMm),
        height: Math.floor((hmm - 24) * pxPerMm),
      });
      const figs = await page.$$eval('figure.map-page', (fs) =>
        fs.map((f) => f.getBoundingClientRect().height),
      );
      for (const h of figs) expect(h).toBeLessThanOrEqual((hmm - 24) * pxPerMm);
      const pdf = await page.pdf({ format, path: join(ART, `report-demo-${format}.pdf`) });
      const pages = (pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length;
      // one map per page, after at least one page of title block and tables
      expect(pages).toBeGreaterThanOrEqual(mapCount + 1);
    }
    await page.close();
  });

  it('chromium --print-to-pdf gives pages that pdftoppm renders (look at test-artifacts/print-*.png)', (ctx) => {
    // checked here, not at collection, so a missing poppler-utils fails (CI) or skips only this test
    if (!requireTool('pdftoppm', 'poppler-utils', ['-v'])) return ctx.skip();
    const pdf = join(ART, 'report-demo-cli.pdf');
    rmSync(pdf, { force: true });
    const r = spawnSync(
      CHROMIUM,
      [
        '--headless',
        ...ARGS,
        '--no-pdf-header-footer',
        `--print-to-pdf=${pdf}`,
        pathToFileURL(htmlPath).href,
      ],
      { encoding: 'utf8', timeout: 90_000 },
    );
    expect(existsSync(pdf), r.stderr).toBe(true);
    expect(statSync(pdf).size).toBeGreaterThan(10_000);
    for (const f of readdirSync(ART)) if (f.startsWith('print-')) rmSync(join(ART, f));
    const p = spawnSync('pdftoppm', ['-r', '50', '-png', pdf, join(ART, 'print')], {
      encoding: 'utf8',
      timeout: 90_000,
    });
    expect(p.status, p.stderr).toBe(0);
    const pngs = readdirSync(ART).filter((f) => f.startsWith('print-') && f.endsWith('.png'));
    expect(pngs.length).toBeGreaterThanOrEqual(input.surfaces.length + 3);
  });
});
