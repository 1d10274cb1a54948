/**
 * Browser test of the HTML report: headless Chromium (Debian's /usr/bin/chromium, or the path
 * in FOLDWISE_CHROMIUM) opens the page from disk with a fresh profile. Driven over the DevTools
 * protocol on --remote-debugging-pipe (file descriptors 3 and 4, NUL-terminated JSON messages;
 * Chrome DevTools Protocol documentation, free at chromedevtools.github.io), it checks that the
 * page loads with no console errors, no uncaught exceptions, no error log entries (a Content
 * Security Policy violation would be one) and no network request besides the file itself.
 * A second run takes a --screenshot at 1200x1600; the PNG is decoded here (PNG specification,
 * W3C, free: chunks, zlib-compressed IDAT, per-row filters 0-4) and must not be one colour.
 * The pages: eval and tune pages of the bundled demo, and of the hostile data of
 * html-fixtures.ts.
 *
 * The test skips itself, saying why, when Chromium is not installed (.ci/run installs it).
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { Readable, Writable } from 'node:stream';
import { deflateSync, inflateSync } from 'node:zlib';
import { afterAll, describe, expect, it } from 'vitest';
import { cli } from '../helpers/cli.js';
import { penguinsCsv } from '../helpers/penguins.js';
import { tempFolder } from '../helpers/tmp.js';
import { HOSTILE_GROUP, HOSTILE_MODES, HOSTILE_TARGET, hostileCsv } from './html-fixtures.js';

const CHROMIUM = process.env.FOLDWISE_CHROMIUM ?? '/usr/bin/chromium';
const HAVE = existsSync(CHROMIUM);
const FLAGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-dev-shm-usage', '--hide-scrollbars'];
if (!HAVE) console.warn(`html-browser.test.ts: skipped, ${CHROMIUM} not found (install Debian's chromium: apt-get install -y chromium, or set FOLDWISE_CHROMIUM)`);

const profiles: string[] = [];
afterAll(() => profiles.forEach((p) => rmSync(p, { recursive: true, force: true })));
function freshProfile(): string {
  const p = mkdtempSync(join(tmpdir(), 'foldwise-chromium-'));
  profiles.push(p);
  return p;
}

interface CdpMessage {
  id?: number;
  method?: string;
  params?: Record<string, unknown>;
  result?: Record<string, unknown>;
  error?: { message: string };
  sessionId?: string;
}

interface PageLoad {
  consoleErrors: string[];
  exceptions: string[];
  logErrors: string[];
  requests: string[];
  scripts: number;
  svgs: number;
}

interface Browser {
  /** Opens `url` in a new tab and records what the page did. */
  load(url: string): Promise<PageLoad>;
  close(): Promise<void>;
}

/** Starts headless Chromium with a fresh profile, driven over the DevTools pipe. */
function openBrowser(): Browser {
  const child = spawn(CHROMIUM, [...FLAGS, `--user-data-dir=${freshProfile()}`, '--remote-debugging-pipe', '--window-size=1200,1600', 'about:blank'], {
    stdio: ['ignore', 'ignore', 'ignore', 'pipe', 'pipe'],
  });
  const toBrowser = child.stdio[3] as Writable;
  const fromBrowser = child.stdio[4] as Readable;
  let nextId = 1;
  const waiting = new Map<number, { resolve: (m: CdpMessage) => void; reject: (e: Error) => void }>();
  const listeners = new Set<(m: CdpMessage) => void>();
  let buffer = '';
  fromBrowser.setEncoding('utf8');
  fromBrowser.on('data', (chunk: string) => {
    buffer += chunk;
    let end;
    while ((end = buffer.indexOf('\0')) >= 0) {
      const msg = JSON.parse(buffer.slice(0, end)) as CdpMessage;
      buffer = buffer.slice(end + 1);
      if (msg.id !== undefined && waiting.has(msg.id)) {
        const w = waiting.get(msg.id)!;
        waiting.delete(msg.id);
        if (msg.error) w.reject(new Error(msg.error.message));
        else w.resolve(msg);
      } else for (const l of listeners) l(msg);
    }
  });
  const exited = new Promise<void>((resolve) => child.on('exit', () => resolve()));
  child.on('exit', () => {
    for (const w of waiting.values()) w.reject(new Error('chromium exited'));
    waiting.clear();
  });
  const send = (method: string, params: Record<string, unknown> = {}, sessionId?: string): Promise<CdpMessage> =>
    new Promise((resolve, reject) => {
      const id = nextId++;
      waiting.set(id, { resolve, reject });
      toBrowser.write(`${JSON.stringify({ id, method, params, ...(sessionId ? { sessionId } : {}) })}\0`);
    });

  async function load(url: string): Promise<PageLoad> {
    const target = await send('Target.createTarget', { url: 'about:blank' });
    const attached = await send('Target.attachToTarget', { targetId: target.result!.targetId, flatten: true });
    const session = attached.result!.sessionId as string;
    const out: PageLoad = { consoleErrors: [], exceptions: [], logErrors: [], requests: [], scripts: -1, svgs: -1 };
    let loaded!: () => void;
    const loadFired = new Promise<void>((resolve) => (loaded = resolve));
    const listener = (m: CdpMessage): void => {
      if (m.sessionId !== session) return;
      const p = m.params ?? {};
      if (m.method === 'Runtime.consoleAPICalled' && (p.type === 'error' || p.type === 'assert')) out.consoleErrors.push(JSON.stringify(p.args));
      if (m.method === 'Runtime.exceptionThrown') out.exceptions.push(JSON.stringify(p.exceptionDetails));
      if (m.method === 'Log.entryAdded') {
        const e = p.entry as { level: string; text: string };
        if (e.level === 'error' || e.level === 'warning') out.logErrors.push(`${e.level}: ${e.text}`);
      }
      if (m.method === 'Network.requestWillBeSent') out.requests.push((p.request as { url: string }).url);
      if (m.method === 'Page.loadEventFired') loaded();
    };
    listeners.add(listener);
    try {
      for (const domain of ['Runtime', 'Log', 'Network', 'Page']) await send(`${domain}.enable`, {}, session);
      await send('Page.navigate', { url }, session);
      let timer: NodeJS.Timeout | undefined;
      await Promise.race([loadFired, new Promise((_, reject) => (timer = setTimeout(() => reject(new Error(`no load event for ${url} within 30 s`)), 30_000)))]);
      clearTimeout(timer);
      await new Promise((r) => setTimeout(r, 300)); // late console or log entries
      const count = async (selector: string): Promise<number> =>
        ((await send('Runtime.evaluate', { expression: `document.querySelectorAll(${JSON.stringify(selector)}).length`, returnByValue: true }, session)).result!.result as { value: number }).value;
      out.scripts = await count('script');
      out.svgs = await count('svg[role="img"]');
      await send('Target.closeTarget', { targetId: target.result!.targetId });
      return out;
    } finally {
      listeners.delete(listener);
    }
  }

  async function close(): Promise<void> {
    await send('Browser.close').catch(() => undefined);
    const timer = setTimeout(() => child.kill('SIGKILL'), 5_000);
    await exited;
    clearTimeout(timer);
  }
  return { load, close };
}

/** Takes a --screenshot of `url` at 1200x1600 and returns the PNG bytes. */
async function screenshot(url: string, file: string): Promise<Buffer> {
  const child = spawn(CHROMIUM, [...FLAGS, `--user-data-dir=${freshProfile()}`, `--screenshot=${file}`, '--window-size=1200,1600', url], { stdio: 'ignore' });
  const timer = setTimeout(() => child.kill('SIGKILL'), 30_000);
  const code = await new Promise<number | null>((resolve) => child.on('exit', (c) => resolve(c)));
  clearTimeout(timer);
  expect(code).toBe(0);
  return readFileSync(file);
}

export interface Png {
  width: number;
  height: number;
  channels: number;
  pixels: Uint8Array;
}

/** Decodes an 8-bit, non-interlaced RGB or RGBA PNG (the kind Chromium writes). */
export function decodePng(png: Buffer): Png {
  expect(png.subarray(0, 8).toString('hex')).toBe('89504e470d0a1a0a');
  let pos = 8;
  let width = 0;
  let height = 0;
  let channels = 0;
  const idat: Buffer[] = [];
  while (pos < png.length) {
    const len = png.readUInt32BE(pos);
    const type = png.toString('latin1', pos + 4, pos + 8);
    const data = png.subarray(pos + 8, pos + 8 + len);
    if (type === 'IHDR') {
      width = data.readUInt32BE(0);
      height = data.readUInt32BE(4);
      expect(data[8]).toBe(8); // bit depth
      expect([2, 6]).toContain(data[9]); // colour type RGB or RGBA
      expect(data[12]).toBe(0); // not interlaced
      channels = data[9] === 6 ? 4 : 3;
    } else if (type === 'IDAT') idat.push(data);
    else if (type === 'IEND') break;
    pos += 12 + len;
  }
  const raw = inflateSync(Buffer.concat(idat));
  const stride = width * channels;
  const pixels = new Uint8Array(height * stride);
  for (let y = 0; y < height; y++) {
    const filter = raw[y * (stride + 1)];
    const line = raw.subarray(y * (stride + 1) + 1, (y + 1) * (stride + 1));
    for (let x = 0; x < stride; x++) {
      const a = x >= channels ? pixels[y * stride + x - channels] : 0;
      const b = y > 0 ? pixels[(y - 1) * stride + x] : 0;
      const c = x >= channels && y > 0 ? pixels[(y - 1) * stride + x - channels] : 0;
      let v = line[x];
      if (filter === 1) v += a;
      else if (filter === 2) v += b;
      else if (filter === 3) v += (a + b) >> 1;
      else if (filter === 4) {
        const p = a + b - c;
        const pa = Math.abs(p - a);
        const pb = Math.abs(p - b);
        const pc = Math.abs(p - c);
        v += pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
      } else expect(filter).toBe(0);
      pixels[y * stride + x] = v & 0xff;
    }
  }
  return { width, height, channels, pixels };
}

/** Distinct colours and the share of pixels that differ from the first one. */
function colourStats(img: Png): { colours: number; notBackground: number } {
  const seen = new Set<number>();
  let differ = 0;
  const n = img.width * img.height;
  const at = (i: number): number => (img.pixels[i * img.channels] << 16) | (img.pixels[i * img.channels + 1] << 8) | img.pixels[i * img.channels + 2];
  const bg = at(0);
  for (let i = 0; i < n; i++) {
    const c = at(i);
    if (seen.size < 100_000) seen.add(c);
    if (c !== bg) differ++;
  }
  return { colours: seen.size, notBackground: differ / n };
}

describe.skipIf(!HAVE)(`HTML report in headless Chromium (${HAVE ? CHROMIUM : `skipped: ${CHROMIUM} not found`})`, async () => {
  const tmp = tempFolder();
  const pages = new Map<string, string>();
  if (HAVE) {
    const demoJson = join(tmp.dir, 'demo.json');
    const e = await cli(['eval', 'examples/packhouse/fruit-grading.csv', '--target', 'grade', '--drop', 'lot_id', '--group', 'orchard', '--no-timing', '--quiet', '--jobs', '1', '--json', demoJson]);
    expect(e.code).toBe(0);
    const hostile = tmp.file('hostile.csv', hostileCsv());
    const hostileJson = join(tmp.dir, 'hostile.json');
    expect((await cli(['eval', hostile, '--target', HOSTILE_TARGET, '--group', HOSTILE_GROUP, '--learner', 'knn', '--plan', 'kfold:4', '--no-timing', '--quiet', '--jobs', '1', '--json', hostileJson])).code).toBe(0);
    for (const [name, json] of [['demo', demoJson], ['hostile', hostileJson]]) {
      const out = join(tmp.dir, `${name}.html`);
      expect((await cli(['render', json, '--html', out])).code).toBe(0);
      pages.set(name, out);
    }
    // tune pages: the demo with a small two-option grid, and the hostile data (written by tune --html)
    const tuneDemo = join(tmp.dir, 'tune-demo.html');
    const t = await cli(['tune', 'examples/packhouse/fruit-grading.csv', '--target', 'grade', '--drop', 'lot_id', '--group', 'orchard', '--learner', 'knn:k=3|9|15,vote=equal|inverse', '--plan', 'kfold:3', '--no-timing', '--html', tuneDemo]);
    expect(t.code).toBe(0);
    pages.set('tune-demo', tuneDemo);
    const tuneHostile = join(tmp.dir, 'tune-hostile.html');
    const hostileLearner = `module:${join(dirname(fileURLToPath(import.meta.url)), 'hostile-learner.mjs')};temperature=0.5|2,mode=${HOSTILE_MODES.join('|')}`;
    expect((await cli(['tune', hostile, '--target', HOSTILE_TARGET, '--group', HOSTILE_GROUP, '--learner', hostileLearner, '--plan', 'kfold:3', '--no-timing', '--html', tuneHostile])).code).toBe(0);
    pages.set('tune-hostile', tuneHostile);
  }

  let browser: Browser | undefined;
  afterAll(async () => browser?.close());
  for (const name of ['demo', 'hostile', 'tune-demo', 'tune-hostile']) {
    it(`loads the ${name} page from disk with no console errors and no network requests`, async () => {
      const file = pages.get(name)!;
      const url = pathToFileURL(file).href;
      browser ??= openBrowser();
      const load = await browser.load(url);
      expect(load.consoleErrors).toEqual([]);
      expect(load.exceptions).toEqual([]);
      expect(load.logErrors).toEqual([]);
      expect(load.requests).toEqual([url]); // the page itself, nothing else
      expect(load.scripts).toBe(0);
      expect(load.svgs).toBeGreaterThanOrEqual(name === 'demo' || name === 'tune-demo' ? 3 : 2);
    }, 60_000);
  }

  for (const name of ['demo', 'tune-demo']) {
    it(`draws a screenshot of the ${name} page that is not blank`, async () => {
      const png = await screenshot(pathToFileURL(pages.get(name)!).href, join(tmp.dir, `${name}.png`));
      const img = decodePng(png);
      expect([img.width, img.height]).toEqual([1200, 1600]);
      const { colours, notBackground } = colourStats(img);
      expect(colours).toBeGreaterThan(20);
      expect(notBackground).toBeGreaterThan(0.03);
    }, 60_000);
  }

  it('decodes a PNG it wrote itself (filter 0, RGB), so the decoder is checked too', () => {
    // 2x1 RGB: a red and a blue pixel, built from the PNG specification's chunk layout
    const crc = (buf: Buffer): number => {
      let c = ~0;
      for (const byte of buf) {
        c ^= byte;
        for (let k = 0; k < 8; k++) c = (c >>> 1) ^ (0xedb88320 & -(c & 1));
      }
      return ~c >>> 0;
    };
    const chunk = (type: string, data: Buffer): Buffer => {
      const head = Buffer.alloc(8);
      head.writeUInt32BE(data.length, 0);
      head.write(type, 4, 'latin1');
      const tail = Buffer.alloc(4);
      tail.writeUInt32BE(crc(Buffer.concat([head.subarray(4), data])), 0);
      return Buffer.concat([head, data, tail]);
    };
    const ihdr = Buffer.from([0, 0, 0, 2, 0, 0, 0, 1, 8, 2, 0, 0, 0]);
    const idat = deflateSync(Buffer.from([0, 255, 0, 0, 0, 0, 255]));
    const file = Buffer.concat([Buffer.from('89504e470d0a1a0a', 'hex'), chunk('IHDR', ihdr), chunk('IDAT', idat), chunk('IEND', Buffer.alloc(0))]);
    const img = decodePng(file);
    expect([...img.pixels]).toEqual([255, 0, 0, 0, 0, 255]);
  });
});

describe.skipIf(!HAVE)('the regression page (penguins body mass, vega-datasets) in headless Chromium', async () => {
  const tmp = tempFolder();
  const page = join(tmp.dir, 'regression.html');
  if (HAVE) {
    const data = tmp.file('penguins.csv', penguinsCsv());
    const json = join(tmp.dir, 'regression.json');
    expect((await cli(['eval', data, '--target', 'Body Mass (g)', '--learner', 'knn', '--plan', 'kfold:5x3', '--no-timing', '--quiet', '--jobs', '1', '--json', json])).code).toBe(0);
    expect((await cli(['render', json, '--html', page])).code).toBe(0);
  }
  let browser: Browser | undefined;
  afterAll(async () => browser?.close());

  it('loads with no console errors and no network requests, with the scatter and residual charts', async () => {
    const url = pathToFileURL(page).href;
    browser = openBrowser();
    const load = await browser.load(url);
    expect(load.consoleErrors).toEqual([]);
    expect(load.exceptions).toEqual([]);
    expect(load.logErrors).toEqual([]);
    expect(load.requests).toEqual([url]);
    expect(load.scripts).toBe(0);
    // summary, comparison, scatter and residuals of the best learner, and the baseline's two folded away
    expect(load.svgs).toBe(6);
  }, 60_000);
});
