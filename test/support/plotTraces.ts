/**
 * A small plotting helper for looking at waveforms by eye: draws traces as SVG polylines (min and
 * max per pixel column, so no spike is lost), with arrival marks, and renders the page to PNG in
 * Debian's Chromium through playwright-core. For tests and notes only; outputs go to test/output/.
 */
import { writeFile } from 'node:fs/promises';
import { chromium } from 'playwright-core';

export interface PlotMark {
  /** Seconds from the panel's time origin. */
  readonly t: number;
  readonly label: string;
  readonly color: string;
}

export interface PlotTrace {
  readonly label: string;
  /** Seconds of the first sample from the panel's time origin. */
  readonly t0: number;
  /** Seconds per sample. */
  readonly dt: number;
  readonly values: ArrayLike<number>;
  readonly marks?: readonly PlotMark[];
}

export interface PlotPanel {
  readonly title: string;
  /** Time axis, seconds from the time origin. */
  readonly from: number;
  readonly to: number;
  readonly traces: readonly PlotTrace[];
}

const WIDTH = 1400;
const TRACE_H = 70;
const LEFT = 190;

function esc(s: string): string {
  return s.replace(/[&<>]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;' })[c] as string);
}

/** One panel as SVG: each trace scaled to its own peak in the window. */
export function panelSvg(p: PlotPanel): string {
  const w = WIDTH - LEFT - 10;
  const h = 30 + p.traces.length * TRACE_H + 25;
  const x = (t: number) => LEFT + ((t - p.from) / (p.to - p.from)) * w;
  const parts: string[] = [`<svg xmlns="http://www.w3.org/2000/svg" width="${WIDTH}" height="${h}" font-family="sans-serif" font-size="12">`,
    `<rect width="100%" height="100%" fill="white"/>`, `<text x="8" y="18" font-size="14" font-weight="bold">${esc(p.title)}</text>`];
  p.traces.forEach((tr, k) => {
    const y0 = 30 + k * TRACE_H + TRACE_H / 2;
    const i0 = Math.max(0, Math.floor((p.from - tr.t0) / tr.dt));
    const i1 = Math.min(tr.values.length, Math.ceil((p.to - tr.t0) / tr.dt));
    let peak = 0;
    let mean = 0;
    for (let i = i0; i < i1; i++) mean += tr.values[i];
    mean /= Math.max(1, i1 - i0);
    for (let i = i0; i < i1; i++) peak = Math.max(peak, Math.abs(tr.values[i] - mean));
    const s = peak > 0 ? (TRACE_H * 0.48) / peak : 0;
    const cols = new Map<number, [number, number, number, number]>();
    for (let i = i0; i < i1; i++) {
      const c = Math.round(x(tr.t0 + i * tr.dt));
      const v = tr.values[i] - mean;
      const e = cols.get(c);
      if (!e) cols.set(c, [v, v, v, v]);
      else {
        e[1] = Math.min(e[1], v);
        e[2] = Math.max(e[2], v);
        e[3] = v;
      }
    }
    const pts: string[] = [];
    for (const [c, [f, lo, hi, l]] of [...cols.entries()].sort((a, b) => a[0] - b[0])) {
      for (const v of [f, lo, hi, l]) pts.push(`${c},${(y0 - v * s).toFixed(1)}`);
    }
    parts.push(`<text x="8" y="${y0 - 4}">${esc(tr.label)}</text><text x="8" y="${y0 + 12}" fill="#666">peak ${peak.toPrecision(3)}</text>`);
    parts.push(`<line x1="${LEFT}" x2="${LEFT + w}" y1="${y0}" y2="${y0}" stroke="#eee"/>`);
    parts.push(`<polyline fill="none" stroke="black" stroke-width="0.8" points="${pts.join(' ')}"/>`);
    for (const m of tr.marks ?? []) {
      if (m.t < p.from || m.t > p.to) continue;
      const mx = x(m.t);
      parts.push(`<line x1="${mx}" x2="${mx}" y1="${y0 - TRACE_H / 2 + 4}" y2="${y0 + TRACE_H / 2 - 4}" stroke="${m.color}" stroke-width="1.5"/>`);
      parts.push(`<text x="${mx + 3}" y="${y0 - TRACE_H / 2 + 14}" fill="${m.color}">${esc(m.label)}</text>`);
    }
  });
  const yAxis = 30 + p.traces.length * TRACE_H + 15;
  const step = niceStep((p.to - p.from) / 12);
  for (let t = Math.ceil(p.from / step) * step; t <= p.to; t += step) {
    parts.push(`<line x1="${x(t)}" x2="${x(t)}" y1="${yAxis - 8}" y2="${yAxis - 3}" stroke="black"/><text x="${x(t) - 8}" y="${yAxis + 8}">${+t.toFixed(2)} s</text>`);
  }
  parts.push('</svg>');
  return parts.join('\n');
}

function niceStep(raw: number): number {
  const p = 10 ** Math.floor(Math.log10(raw));
  for (const m of [1, 2, 5, 10]) if (m * p >= raw) return m * p;
  return 10 * p;
}

/** Renders panels one below the other to a PNG file. */
export async function plotPng(panels: readonly PlotPanel[], pngPath: string): Promise<void> {
  const html = `<!doctype html><html><body style="margin:0">${panels.map(panelSvg).join('<br>')}</body></html>`;
  await writeFile(pngPath.replace(/\.png$/, '.html'), html);
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: ['--no-sandbox', '--headless', '--disable-background-networking', '--disable-component-update'],
  });
  try {
    const page = await browser.newPage({ viewport: { width: WIDTH, height: 400 } });
    await page.setContent(html);
    await page.screenshot({ path: pngPath, fullPage: true });
  } finally {
    await browser.close();
  }
}
