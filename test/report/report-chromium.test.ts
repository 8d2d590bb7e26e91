// The report opened in a real browser (headless Chromium): a scan of chain-24 with C_intra_0 left open,
// built in test/report/chain-report-input.ts from the engine (design for the predictions, board as built
// for the "measured" values). Checks what a person would see: the plots are there and hold every node,
// the two maps order their colours by |Z|, the page asks for nothing from outside and logs no error, and
// a board named <script>…</script> shows as text with nothing run.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Browser, type Page } from 'playwright-core';
import { renderReport } from '../../src/report/render-report.js';
import type { ReportInput } from '../../src/report/report-input.js';
import { relativeLuminance } from '../../src/report/colour-scale.js';
import { toolAvailable } from '../support/requirements.js';
import { chainReportInput, FAULT, renameNode, SWEPT_NODES, TRANSFER_DRIVE } from './chain-report-input.js';

const LAUNCH = {
  executablePath: '/usr/bin/chromium',
  args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
};

const EVIL_BOARD = '<script>alert(1)</script>';
const EVIL_NODE = '<img src=x onerror=alert(2)>';

interface Opened {
  page: Page;
  problems: string[];
  dialogs: string[];
}

const haveChromium = toolAvailable('chromium');

describe.skipIf(!haveChromium)('the report in headless Chromium', () => {
  let browser: Browser;
  let dir: string;
  let input: ReportInput;

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-report-'));
    input = chainReportInput();
    browser = await chromium.launch(LAUNCH);
  });

  afterAll(async () => {
    await browser?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  /** Writes the page to a file and opens it, recording every error, dialog and request beyond the file itself. */
  async function open(report: ReportInput, name: string): Promise<Opened> {
    const file = path.join(dir, name);
    writeFileSync(file, renderReport(report));
    const url = pathToFileURL(file).href;
    const page = await browser.newPage({ viewport: { width: 1200, height: 900 } });
    const problems: string[] = [];
    const dialogs: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error' || m.type() === 'warning') problems.push(`console ${m.type()}: ${m.text()}`);
    });
    page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
    page.on('requestfailed', (r) => problems.push(`request failed: ${r.url()}`));
    page.on('request', (r) => {
      if (r.url() !== url) problems.push(`request: ${r.url()}`);
    });
    page.on('dialog', (d) => {
      dialogs.push(d.message());
      void d.dismiss();
    });
    await page.goto(url, { waitUntil: 'load' });
    return { page, problems, dialogs };
  }

  it('renders every section with its plots, with no error and no request beyond the file', async () => {
    const { page, problems, dialogs } = await open(input, 'report.html');
    try {
      expect(await page.title()).toBe('Scan report: chain-24');
      for (const section of ['report-header', 'modes', 'board-maps', 'profile', 'sweeps', 'transfer', 'deviations', 'diagnosis', 'fit']) {
        await expect.poll(() => page.locator(`.${section}`).first().isVisible()).toBe(true);
      }
      // Two maps, one profile, a |Z| and a phase plot per swept node, one transfer plot, the colour bar.
      const plots = await page.locator('svg.board-map, svg.plot, svg.colour-bar').count();
      expect(plots).toBe(2 + 1 + 2 * SWEPT_NODES.length + 1 + 1);
      expect(await page.locator('figure.sweep').count()).toBe(SWEPT_NODES.length);

      const nodes = input.board.nodes.map((n) => n.name);
      for (const map of ['map-measured', 'map-predicted']) {
        const names = await page.locator(`svg.${map} circle.node`).evaluateAll((els) => els.map((e) => e.getAttribute('data-node')));
        expect(names).toEqual(nodes);
      }
      const profileNodes = await page.locator('svg.profile-plot .markers [data-node]').evaluateAll((els) => els.map((e) => e.getAttribute('data-node')));
      expect(profileNodes).toEqual(nodes);
      const transferNodes = await page.locator('svg.transfer-plot .markers [data-node]').count();
      expect(transferNodes).toBe(nodes.length);
      expect(await page.locator('svg.transfer-plot').getAttribute('aria-label')).toContain(`drive ${TRANSFER_DRIVE}`);

      // The deviation table lists exactly the readings flagged in the data, each marked by shape and word.
      const flagged = input.readings.filter((r) => r.flag !== 'ok').length;
      expect(await page.locator('.deviations tbody tr').count()).toBe(flagged);
      expect(await page.locator('.deviations tbody tr.flag-deviation polygon').count()).toBe(input.readings.filter((r) => r.flag === 'deviation').length);

      // The diagnosis leads with the part the fault took out.
      const fault = FAULT.split('=')[0];
      expect(await page.locator('.diagnosis tbody tr').first().textContent()).toContain(fault);
      expect(await page.locator('.fit tbody tr').count()).toBe(input.fit!.parameters.length + input.fit!.spread!.length);

      expect(problems).toEqual([]);
      expect(dialogs).toEqual([]);

      const shot = path.join(tmpdir(), 'topoprobe-report-chromium.png');
      await page.screenshot({ path: shot, fullPage: true });
      expect(statSync(shot).size).toBeGreaterThan(50_000);
      process.stdout.write(`report screenshot: ${shot}\n`);
    } finally {
      await page.close();
    }
  });

  it('colours both maps on one scale: a larger |Z| is a lighter node (sequential scale, common practice)', async () => {
    const { page } = await open(input, 'report-colours.html');
    try {
      const f = input.modes![0].frequency_hz;
      const atMode = input.readings.filter((r) => r.kind === 'to-ground' && r.frequency_hz === f);
      for (const [map, size] of [
        ['map-predicted', (r: (typeof atMode)[number]) => Math.hypot(r.pred_re, r.pred_im)],
        ['map-measured', (r: (typeof atMode)[number]) => Math.hypot(r.re, r.im)],
      ] as const) {
        const fills = await page.locator(`svg.${map} circle.node`).evaluateAll((els) => els.map((e) => [e.getAttribute('data-node'), getComputedStyle(e).fill] as const));
        const shown = fills.flatMap(([node, fill]) => {
          const r = atMode.find((x) => x.hi === node)!;
          const m = /rgb\((\d+), (\d+), (\d+)\)/.exec(fill);
          if (!m || !Number.isFinite(size(r))) return [];
          return [{ size: size(r), luminance: relativeLuminance({ r: Number(m[1]), g: Number(m[2]), b: Number(m[3]) }) }];
        });
        expect(shown.length).toBeGreaterThan(20);
        shown.sort((a, b) => a.size - b.size);
        for (let i = 1; i < shown.length; i++) expect(shown[i].luminance).toBeGreaterThanOrEqual(shown[i - 1].luminance - 1e-9);
      }
      // The open part shows: n1 reads far below its prediction, so the two maps give it different colours.
      const fillOf = (map: string) => page.locator(`svg.${map} circle.node[data-node="n1"]`).evaluate((e) => getComputedStyle(e).fill);
      expect(await fillOf('map-measured')).not.toBe(await fillOf('map-predicted'));
    } finally {
      await page.close();
    }
  });

  it('shows a board named <script>…</script> and a node named <img …> as text, running nothing', async () => {
    const hostile = renameNode({ ...input, board: { ...input.board, name: EVIL_BOARD }, meta: { ...input.meta, board: EVIL_BOARD } }, 'n24', EVIL_NODE);
    const { page, problems, dialogs } = await open(hostile, 'report-hostile.html');
    try {
      expect(await page.title()).toBe(`Scan report: ${EVIL_BOARD}`);
      const heading = page.locator('h1');
      expect(await heading.isVisible()).toBe(true);
      expect(await heading.textContent()).toContain(EVIL_BOARD);
      expect(await page.locator('script, img').count()).toBe(0);
      // The node keeps its name as text: in the map label and as the profile point's node.
      expect(await page.locator('svg.map-measured .node-label', { hasText: EVIL_NODE }).count()).toBe(1);
      expect(await page.locator(`svg.profile-plot [data-node="${EVIL_NODE}"]`).count()).toBe(1);
      expect(dialogs).toEqual([]);
      expect(problems).toEqual([]);
    } finally {
      await page.close();
    }
  });
});
