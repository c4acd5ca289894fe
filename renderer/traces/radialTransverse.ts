/**
 * Radial and transverse rows: a view option of the event sheet. Once the open event has a location,
 * each site's two horizontals are rotated to radial (R, positive from the source towards the site)
 * and transverse (T, R turned 90 degrees clockwise seen from above), with the back-azimuth from the
 * site to the current epicentre (core/dsp/rotate.ts; the convention and its check are there).
 *
 * The rotation works on the traces as the data worker delivered them, i.e. after filtering: both
 * horizontals go through the same filter, and a linear time-invariant filter commutes with a
 * constant rotation (R = a N + b E filtered is a (filtered N) + b (filtered E)), so rotating filtered
 * traces gives the filtered radial and transverse.
 *
 * Channel orientation: the StationXML azimuth of each horizontal when known, else 0 for a code
 * ending in N and 90 for one ending in E (SEED orientation codes); channels 1/2 without metadata are
 * left as they are. The two horizontals' pieces are paired where they overlap on a common sample
 * grid (same interval, starts within a quarter sample); elsewhere the row shows no R/T.
 *
 * The rotated components keep the keys of the horizontals they replace (R the first, T the second),
 * so a pick placed on an R or T band is stored on a real channel of the site.
 */
import { rotateToNorthEast, rotateToRadialTransverse } from '../../core/dsp/rotate';
import { azimuthDeg } from '../../core/location/geiger';
import type { SiteLocation } from '../../core/location/fromReview';
import { makePiece, type ComponentTrace, type TracePiece } from './rowData';
import type { SiteRow } from './traceView';

/** Orientation of a horizontal channel, degrees clockwise from north, or undefined when unknown. */
export function horizontalAzimuth(key: string, metaAzimuth: number | null | undefined): number | undefined {
  if (typeof metaAzimuth === 'number' && Number.isFinite(metaAzimuth)) return metaAzimuth;
  const c = key.slice(-1);
  return c === 'N' ? 0 : c === 'E' ? 90 : undefined;
}

const isHorizontal = (key: string): boolean => /[NE12]$/.test(key);

/**
 * Pieces of R and T from the pieces of two horizontals with axes at azA and azB degrees, for a source
 * at back-azimuth `baz` degrees. Pieces are paired where they overlap on a common sample grid.
 */
export function rotatePieces(a: readonly TracePiece[], b: readonly TracePiece[], azA: number, azB: number, baz: number): { r: TracePiece[]; t: TracePiece[] } {
  const r: TracePiece[] = [];
  const t: TracePiece[] = [];
  for (const pa of a) {
    for (const pb of b) {
      const dt = pa.dt;
      if (Math.abs(pb.dt - dt) > 1e-9 * dt) continue;
      const k = Math.round((pb.t0 - pa.t0) / dt); // sample j of b is sample j + k of a
      if (Math.abs(pb.t0 - pa.t0 - k * dt) > 0.25 * dt) continue;
      const i0 = Math.max(0, k);
      const i1 = Math.min(pa.samples.length, k + pb.samples.length);
      if (i1 - i0 < 2) continue;
      const sa = pa.samples.subarray(i0, i1);
      const sb = pb.samples.subarray(i0 - k, i1 - k);
      const ne = rotateToNorthEast(sa, sb, azA, azB);
      const rt = rotateToRadialTransverse(ne.north, ne.east, baz);
      const t0 = pa.t0 + i0 * dt;
      r.push(makePiece(t0, 1 / dt, Float32Array.from(rt.radial)));
      t.push(makePiece(t0, 1 / dt, Float32Array.from(rt.transverse)));
    }
  }
  return { r, t };
}

/**
 * A row with its two horizontals replaced by R and T for back-azimuth `baz`, or a reason why not.
 * `azimuthOf` gives a channel's orientation (see horizontalAzimuth).
 */
export function rotateRow(row: SiteRow, baz: number, azimuthOf: (key: string) => number | undefined): SiteRow | string {
  const hs = row.components.map((c, i) => ({ c, i })).filter((x) => x.i > 0 && isHorizontal(x.c.key));
  if (hs.length !== 2) return `${row.key}: ${hs.length} horizontal${hs.length === 1 ? '' : 's'} shown`;
  const [h1, h2] = hs;
  const az1 = azimuthOf(h1.c.key);
  const az2 = azimuthOf(h2.c.key);
  if (az1 === undefined || az2 === undefined) return `${row.key}: orientation of ${az1 === undefined ? h1.c.key : h2.c.key} unknown`;
  let rotated: { r: TracePiece[]; t: TracePiece[] };
  try {
    rotated = rotatePieces(h1.c.pieces, h2.c.pieces, az1, az2, baz);
  } catch (e) {
    return `${row.key}: ${e instanceof Error ? e.message : String(e)}`;
  }
  const code = (c: ComponentTrace) => c.key.split('.')[3] ?? c.label;
  const comps = row.components.slice();
  comps[h1.i] = { key: h1.c.key, label: `${code(h1.c).slice(0, 2)}R`, pieces: rotated.r };
  comps[h2.i] = { key: h2.c.key, label: `${code(h2.c).slice(0, 2)}T`, pieces: rotated.t };
  const bazText = `baz ${Math.round(baz) % 360}\u00b0`;
  return { ...row, components: comps, detail: row.detail ? `${row.detail} \u00b7 ${bazText}` : bazText };
}

export interface Epicentre { latDeg: number; lonDeg: number }

/**
 * The sheet's rows as shown: as read, or with R/T when the option is on and an epicentre is known.
 * Keeps each site's row as read (`shown` records it) and its rotated row (reused while the
 * back-azimuth, rounded to 0.1 degree, and the row as read stay the same), so a relocation after a
 * pick edit re-rotates only the sites whose back-azimuth really moved, and switching the option
 * needs no new read.
 *
 *   row = rotation.shown(rowAsRead);                  // wherever a row is built
 *   if (rotation.setEpicentre(h)) rows = rotation.reshow(rows);   // after a relocation
 */
export class RadialTransverseRows {
  /** The option (the sheet's R/T toggle). */
  on = false;
  private epicentre: Epicentre | null = null;
  private readonly asRead = new Map<string, SiteRow>();
  private readonly cache = new Map<string, { source: SiteRow; baz: number; shown: SiteRow | string }>();
  /** Sites left as recorded while R/T is active, with the reason (from their last shown()). */
  readonly skipped = new Map<string, string>();

  constructor(
    private readonly sites: () => ReadonlyMap<string, SiteLocation>,
    private readonly azimuthOf: (key: string) => number | undefined,
  ) {}

  /** Back-azimuth from a site to the epicentre, degrees, rounded to 0.1 (undefined without coordinates). */
  backAzimuth(site: string): number | undefined {
    const s = this.sites().get(site);
    const e = this.epicentre;
    if (!s || !e) return undefined;
    return Math.round(azimuthDeg(s.latitude, s.longitude, e.latDeg, e.lonDeg) * 10) / 10;
  }

  /**
   * Sets the epicentre (null: none). True when the rows shown change with it (the option is on and
   * some site's rounded back-azimuth moved, or the epicentre appeared or went away).
   */
  setEpicentre(e: Epicentre | null): boolean {
    const keys = [...this.asRead.keys()];
    const before = keys.map((k) => this.backAzimuth(k)).join(',');
    this.epicentre = e ? { latDeg: e.latDeg, lonDeg: e.lonDeg } : null;
    return this.on && keys.map((k) => this.backAzimuth(k)).join(',') !== before;
  }

  /** Whether R/T is shown now (on, and an epicentre known). */
  get active(): boolean {
    return this.on && this.epicentre !== null;
  }

  /** The row to show for a row as read (recorded for reshow). */
  shown(row: SiteRow): SiteRow {
    this.asRead.set(row.key, row);
    this.skipped.delete(row.key);
    if (!this.active) return row;
    const baz = this.backAzimuth(row.key);
    if (baz === undefined) {
      this.skipped.set(row.key, `${row.key}: no coordinates`);
      return row;
    }
    let c = this.cache.get(row.key);
    if (!c || c.source !== row || c.baz !== baz) {
      c = { source: row, baz, shown: rotateRow(row, baz, this.azimuthOf) };
      this.cache.set(row.key, c);
    }
    if (typeof c.shown === 'string') {
      this.skipped.set(row.key, c.shown);
      return row;
    }
    return c.shown;
  }

  /** The rows to show in place of `rows` (rows shown before), from their rows as read. */
  reshow(rows: readonly SiteRow[]): SiteRow[] {
    return rows.map((r) => this.shown(this.asRead.get(r.key) ?? r));
  }
}
