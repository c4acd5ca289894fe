/**
 * FDSN StationXML 1.2 writer: the inverse of {@link parseStationXml} for everything the reader
 * keeps. Elements are written in the order the schema's sequences require (fdsn-station.xsd 1.2:
 * RootType, NetworkType, StationType, ChannelType, ResponseType, ResponseStageType,
 * PolesZerosType, CoefficientsType, FIRType, DecimationType). Numbers are written with JavaScript's
 * shortest round-trip form, so reading the output gives back the same doubles.
 */
import { isoFromMicros, type Micros } from '../time';
import type { ChannelMeta, Inventory, NetworkMeta, ResponseStage, Sensitivity, StationMeta } from './types';

const NAMESPACE = 'http://www.fdsn.org/xml/station/1';

function esc(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&apos;' })[c] as string);
}

function num(path: string, n: number): string {
  if (!Number.isFinite(n)) throw new RangeError(`${path} must be a finite number, got ${n}`);
  return String(n);
}

function dateAttrs(start: Micros | null, end: Micros | null): string {
  return (start === null ? '' : ` startDate="${isoFromMicros(start)}"`) + (end === null ? '' : ` endDate="${isoFromMicros(end)}"`);
}

class Out {
  private readonly lines: string[] = [];
  line(depth: number, s: string): void {
    this.lines.push('  '.repeat(depth) + s);
  }
  leaf(depth: number, name: string, value: string, attrs = ''): void {
    this.line(depth, `<${name}${attrs}>${esc(value)}</${name}>`);
  }
  units(depth: number, name: string, unit: string): void {
    this.line(depth, `<${name}>`);
    this.leaf(depth + 1, 'Name', unit);
    this.line(depth, `</${name}>`);
  }
  toString(): string {
    return this.lines.join('\n') + '\n';
  }
}

function writeSensitivity(o: Out, d: number, s: Sensitivity, path: string): void {
  o.line(d, '<InstrumentSensitivity>');
  o.leaf(d + 1, 'Value', num(`${path}.value`, s.value));
  o.leaf(d + 1, 'Frequency', num(`${path}.frequency`, s.frequency));
  o.units(d + 1, 'InputUnits', s.inputUnits);
  o.units(d + 1, 'OutputUnits', s.outputUnits);
  o.line(d, '</InstrumentSensitivity>');
}

function writeStage(o: Out, d: number, st: ResponseStage, path: string): void {
  o.line(d, `<Stage number="${num(`${path}.number`, st.number)}">`);
  const f = st.filter;
  if (f) {
    if (f.kind === 'polynomial') throw new RangeError(`${path}: Polynomial stages are not written (only read)`);
    if (st.inputUnits === null || st.outputUnits === null) {
      throw new RangeError(`${path}: a stage with a filter needs inputUnits and outputUnits`);
    }
    const tag = { polesZeros: 'PolesZeros', coefficients: 'Coefficients', fir: 'FIR', responseList: 'ResponseList' }[f.kind];
    o.line(d + 1, `<${tag}>`);
    o.units(d + 2, 'InputUnits', st.inputUnits);
    o.units(d + 2, 'OutputUnits', st.outputUnits);
    if (f.kind === 'polesZeros') {
      o.leaf(d + 2, 'PzTransferFunctionType', f.transferFunction);
      o.leaf(d + 2, 'NormalizationFactor', num(`${path}.normalizationFactor`, f.normalizationFactor));
      o.leaf(d + 2, 'NormalizationFrequency', num(`${path}.normalizationFrequency`, f.normalizationFrequency));
      for (const [name, list] of [['Zero', f.zeros], ['Pole', f.poles]] as const) {
        list.forEach((z, i) => {
          o.line(d + 2, `<${name} number="${i}">`);
          o.leaf(d + 3, 'Real', num(`${path}.${name}[${i}].re`, z.re));
          o.leaf(d + 3, 'Imaginary', num(`${path}.${name}[${i}].im`, z.im));
          o.line(d + 2, `</${name}>`);
        });
      }
    } else if (f.kind === 'coefficients') {
      o.leaf(d + 2, 'CfTransferFunctionType', f.transferFunction);
      f.numerator.forEach((c, i) => o.leaf(d + 2, 'Numerator', num(`${path}.numerator[${i}]`, c), ` number="${i}"`));
      f.denominator.forEach((c, i) => o.leaf(d + 2, 'Denominator', num(`${path}.denominator[${i}]`, c), ` number="${i}"`));
    } else if (f.kind === 'fir') {
      o.leaf(d + 2, 'Symmetry', f.symmetry);
      f.coefficients.forEach((c, i) => o.leaf(d + 2, 'NumeratorCoefficient', num(`${path}.coefficients[${i}]`, c), ` i="${i}"`));
    } else {
      f.points.forEach((p, i) => {
        o.line(d + 2, '<ResponseListElement>');
        o.leaf(d + 3, 'Frequency', num(`${path}.points[${i}].frequency`, p.frequency));
        o.leaf(d + 3, 'Amplitude', num(`${path}.points[${i}].amplitude`, p.amplitude));
        o.leaf(d + 3, 'Phase', num(`${path}.points[${i}].phase`, p.phase));
        o.line(d + 2, '</ResponseListElement>');
      });
    }
    o.line(d + 1, `</${tag}>`);
  }
  if (st.decimation) {
    const dec = st.decimation;
    o.line(d + 1, '<Decimation>');
    o.leaf(d + 2, 'InputSampleRate', num(`${path}.decimation.inputSampleRate`, dec.inputSampleRate));
    o.leaf(d + 2, 'Factor', num(`${path}.decimation.factor`, dec.factor));
    o.leaf(d + 2, 'Offset', num(`${path}.decimation.offset`, dec.offset));
    o.leaf(d + 2, 'Delay', num(`${path}.decimation.delay`, dec.delay));
    o.leaf(d + 2, 'Correction', num(`${path}.decimation.correction`, dec.correction));
    o.line(d + 1, '</Decimation>');
  }
  if (!st.gain) throw new RangeError(`${path}: StageGain is required by the schema for this stage`);
  o.line(d + 1, '<StageGain>');
  o.leaf(d + 2, 'Value', num(`${path}.gain.value`, st.gain.value));
  o.leaf(d + 2, 'Frequency', num(`${path}.gain.frequency`, st.gain.frequency));
  o.line(d + 1, '</StageGain>');
  o.line(d, '</Stage>');
}

function writeChannel(o: Out, d: number, c: ChannelMeta, path: string): void {
  o.line(d, `<Channel code="${esc(c.id.channel)}"${dateAttrs(c.start, c.end)} locationCode="${esc(c.id.location)}">`);
  o.leaf(d + 1, 'Latitude', num(`${path}.latitude`, c.latitude), ' unit="DEGREES"');
  o.leaf(d + 1, 'Longitude', num(`${path}.longitude`, c.longitude), ' unit="DEGREES"');
  o.leaf(d + 1, 'Elevation', num(`${path}.elevation`, c.elevation), ' unit="m"');
  o.leaf(d + 1, 'Depth', num(`${path}.depth`, c.depth), ' unit="m"');
  if (c.azimuth !== null) o.leaf(d + 1, 'Azimuth', num(`${path}.azimuth`, c.azimuth), ' unit="DEGREES"');
  if (c.dip !== null) o.leaf(d + 1, 'Dip', num(`${path}.dip`, c.dip), ' unit="DEGREES"');
  if (c.sampleRate !== null) o.leaf(d + 1, 'SampleRate', num(`${path}.sampleRate`, c.sampleRate), ' unit="SAMPLES/S"');
  if (c.sensor !== undefined) {
    o.line(d + 1, '<Sensor>');
    o.leaf(d + 2, 'Description', c.sensor);
    o.line(d + 1, '</Sensor>');
  }
  if (c.sensitivity || c.stages.length > 0) {
    o.line(d + 1, '<Response>');
    if (c.sensitivity) writeSensitivity(o, d + 2, c.sensitivity, `${path}.sensitivity`);
    c.stages.forEach((st, i) => writeStage(o, d + 2, st, `${path}.stages[${i}]`));
    o.line(d + 1, '</Response>');
  }
  o.line(d, '</Channel>');
}

function writeStation(o: Out, d: number, s: StationMeta, path: string): void {
  o.line(d, `<Station code="${esc(s.code)}"${dateAttrs(s.start, s.end)}>`);
  o.leaf(d + 1, 'Latitude', num(`${path}.latitude`, s.latitude), ' unit="DEGREES"');
  o.leaf(d + 1, 'Longitude', num(`${path}.longitude`, s.longitude), ' unit="DEGREES"');
  o.leaf(d + 1, 'Elevation', num(`${path}.elevation`, s.elevation), ' unit="m"');
  o.line(d + 1, '<Site>');
  o.leaf(d + 2, 'Name', s.site ?? s.code);
  o.line(d + 1, '</Site>');
  s.channels.forEach((c, i) => writeChannel(o, d + 1, c, `${path}.channels[${i}]`));
  o.line(d, '</Station>');
}

function writeNetwork(o: Out, d: number, n: NetworkMeta, path: string): void {
  o.line(d, `<Network code="${esc(n.code)}"${dateAttrs(n.start, n.end)}>`);
  if (n.description !== undefined) o.leaf(d + 1, 'Description', n.description);
  n.stations.forEach((s, i) => writeStation(o, d + 1, s, `${path}.stations[${i}]`));
  o.line(d, '</Network>');
}

/**
 * Writes an inventory as an FDSN StationXML 1.2 document (UTF-8 text).
 * @throws RangeError when `inv.created` is null (the schema requires `Created`), when a number is
 *   not finite, or for a stage the schema cannot hold as given (no StageGain; a Polynomial stage)
 */
export function writeStationXml(inv: Inventory): string {
  if (inv.created === null) throw new RangeError('inventory.created is required (StationXML <Created>), got null');
  if (inv.networks.length === 0) throw new RangeError('inventory.networks must hold at least one network, got none');
  const o = new Out();
  o.line(0, '<?xml version="1.0" encoding="UTF-8"?>');
  o.line(0, `<FDSNStationXML xmlns="${NAMESPACE}" schemaVersion="1.2">`);
  o.leaf(1, 'Source', inv.source ?? 'Daybreak');
  if (inv.sender !== undefined) o.leaf(1, 'Sender', inv.sender);
  if (inv.module !== undefined) o.leaf(1, 'Module', inv.module);
  o.leaf(1, 'Created', isoFromMicros(inv.created));
  inv.networks.forEach((n, i) => writeNetwork(o, 1, n, `networks[${i}]`));
  o.line(0, '</FDSNStationXML>');
  return o.toString();
}
