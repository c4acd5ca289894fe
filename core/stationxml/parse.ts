/**
 * FDSN StationXML reader (schema 1.0, 1.1 and 1.2, namespace http://www.fdsn.org/xml/station/1).
 *
 * The XML itself is parsed by fast-xml-parser; this module walks the resulting tree and keeps what
 * Daybreak uses: per channel epoch the position, orientation, sample rate, overall sensitivity and
 * the response stages. Everything else (comments, operators, equipment other than the sensor's
 * description, data availability) is skipped. Differences between the versions that matter here:
 * 1.0 may carry `StorageFormat` in a channel and `unit` attributes on `Numerator`/`Denominator`
 * (both ignored); 1.1 and 1.2 have the same schema (1.2 changed documentation only, FDSN
 * StationXML changelog "Changes from version 1.1 to 1.2").
 *
 * Every error is a {@link StationXmlError} naming the file, the line and the XML path.
 */
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { formatXmlParser } from '../xml';
import type { Micros } from '../time';
import {
  StationXmlError,
  type CfTransferFunction,
  type ChannelMeta,
  type Complex,
  type Decimation,
  type Gain,
  type Inventory,
  type NetworkMeta,
  type PzTransferFunction,
  type ResponseStage,
  type Sensitivity,
  type StageFilter,
  type StationMeta,
} from './types';

/** Elements that may repeat, so the parser always gives them as arrays. */
const REPEATED = new Set([
  'Network', 'Station', 'Channel', 'Stage', 'Zero', 'Pole', 'Numerator', 'Denominator',
  'NumeratorCoefficient', 'ResponseListElement', 'Coefficient', 'Comment', 'Identifier', 'Equipment',
  'Operator', 'Type', 'ExternalReference', 'CalibrationDate',
]);

const META = XMLParser.getMetaDataSymbol() as unknown as symbol;

// The parsed tree: elements are objects (attributes under "@_name", text under "#text") or, for
// elements with text only, strings.
type XmlNode = Record<string | symbol, unknown>;
type XmlValue = XmlNode | string | undefined;

/** Where the walk is: the file, the text (for line numbers), the XML path and the nearest element with a known offset. */
interface Where {
  readonly file: string;
  readonly text: string;
  readonly path: string;
  readonly node: XmlNode;
}

function lineOf(text: string, index: number): number {
  let line = 1;
  for (let i = text.indexOf('\n'); i !== -1 && i < index; i = text.indexOf('\n', i + 1)) line++;
  return line;
}

function fail(at: Where, child: string | null, reason: string): never {
  const meta = at.node[META] as { startIndex?: number } | undefined;
  const line = meta?.startIndex === undefined ? null : lineOf(at.text, meta.startIndex);
  throw new StationXmlError(at.file, line, child ? `${at.path}/${child}` : at.path, reason);
}

function enter(at: Where, name: string, node: unknown, label?: string): Where {
  const path = `${at.path}/${name}${label === undefined ? '' : `[${label}]`}`;
  return { file: at.file, text: at.text, path, node: isNode(node) ? node : at.node };
}

function isNode(v: unknown): v is XmlNode {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function asArray(v: unknown): XmlValue[] {
  if (v === undefined) return [];
  return Array.isArray(v) ? (v as XmlValue[]) : [v as XmlValue];
}

/** Text content of an element (string element or "#text" of an element with attributes). */
function textOf(v: unknown): string | undefined {
  if (v === undefined || v === null) return undefined;
  if (typeof v === 'string') return v.trim();
  if (typeof v === 'number' || typeof v === 'boolean') return String(v);
  if (isNode(v)) {
    const t = v['#text'];
    return t === undefined ? '' : String(t).trim();
  }
  return undefined;
}

function attr(node: XmlValue, name: string): string | undefined {
  if (!isNode(node)) return undefined;
  const v = node[`@_${name}`];
  return v === undefined ? undefined : String(v);
}

function optText(node: XmlNode, name: string): string | undefined {
  const t = textOf(node[name]);
  return t === undefined || t === '' ? undefined : t;
}

function reqNode(at: Where, name: string): XmlNode {
  const v = at.node[name];
  if (v === undefined) fail(at, name, 'required element is missing');
  if (Array.isArray(v)) fail(at, name, 'element must appear once');
  return isNode(v) ? v : { '#text': v };
}

function parseNumber(at: Where, name: string, raw: string): number {
  const n = raw === '' ? NaN : Number(raw);
  if (!Number.isFinite(n)) fail(at, name, `not a number: "${raw}"`);
  return n;
}

function optNumber(at: Where, name: string): number | undefined {
  const v = at.node[name];
  if (v === undefined) return undefined;
  if (Array.isArray(v)) fail(at, name, 'element must appear once');
  return parseNumber(at, name, textOf(v) ?? '');
}

function reqNumber(at: Where, name: string): number {
  const n = optNumber(at, name);
  if (n === undefined) fail(at, name, 'required element is missing');
  return n;
}

function inRange(at: Where, name: string, value: number, lo: number, hi: number): number {
  if (value < lo || value > hi) fail(at, name, `${value} is outside [${lo}, ${hi}]`);
  return value;
}

/** Metres per unit for the `unit` attribute of a `DistanceType` (default "m"). */
function metresPer(at: Where, name: string, unit: string | undefined): number {
  if (unit === undefined) return 1;
  const u = unit.trim().toUpperCase();
  if (u === 'M' || u === 'METER' || u === 'METERS' || u === 'METRE' || u === 'METRES' || u === '') return 1;
  if (u === 'KM' || u === 'KILOMETER' || u === 'KILOMETERS') return 1000;
  return fail(at, name, `unknown distance unit "${unit}" (m or km expected)`);
}

function distance(at: Where, name: string): number {
  const node = reqNode(at, name);
  return parseNumber(at, name, textOf(node) ?? '') * metresPer(at, name, attr(node, 'unit'));
}

/** Years after which an end date is read as "open": 9999-12-31 and 2599-12-31 are common placeholders. */
const OPEN_END_YEAR = 2200;

const DATE_TIME = /^(-?\d{4,})-(\d{2})-(\d{2})T(\d{2}):(\d{2}):(\d{2})(?:\.(\d+))?(Z|[+-]\d{2}:\d{2})?$/;

/**
 * An `xs:dateTime` as integer microseconds (XML Schema Part 2, section 3.2.7). A time without a
 * zone is taken as UTC (StationXML 1.2 asks for "Z"); an offset is applied. Returns null for a year
 * after 2200 when `openEnd` (a far-future end date means "still running").
 */
export function parseXsDateTime(raw: string, openEnd = false): Micros | null | undefined {
  const m = DATE_TIME.exec(raw.trim());
  if (!m) return undefined;
  const [, ys, mos, ds, hs, mis, ss, frac, zone] = m;
  const y = Number(ys);
  const mo = Number(mos);
  const d = Number(ds);
  const h = Number(hs);
  const mi = Number(mis);
  const s = Number(ss);
  if (openEnd && y > OPEN_END_YEAR) return null;
  if (y < 1000 || y > 9999 || mo < 1 || mo > 12 || d < 1 || h > 24 || mi > 59 || s > 60) return undefined;
  const daysInMonth = new Date(Date.UTC(y, mo, 0)).getUTCDate();
  if (d > daysInMonth) return undefined;
  if (h === 24 && (mi !== 0 || s !== 0 || (frac !== undefined && Number(frac) !== 0))) return undefined;
  let us = 0;
  if (frac !== undefined) {
    const digits = frac.padEnd(7, '0');
    us = Number(digits.slice(0, 6)) + (Number(digits[6]) >= 5 ? 1 : 0);
  }
  let offsetMinutes = 0;
  if (zone !== undefined && zone !== 'Z') {
    const sign = zone[0] === '-' ? -1 : 1;
    offsetMinutes = sign * (Number(zone.slice(1, 3)) * 60 + Number(zone.slice(4, 6)));
  }
  const ms = Date.UTC(y, mo - 1, d, h, mi, s) - offsetMinutes * 60_000;
  const t = ms * 1000 + us;
  if (!Number.isSafeInteger(t)) return openEnd ? null : undefined;
  return t;
}

function dateAttr(at: Where, name: string, openEnd: boolean): Micros | null {
  const raw = attr(at.node, name);
  if (raw === undefined || raw.trim() === '') return null;
  const t = parseXsDateTime(raw, openEnd);
  if (t === undefined) fail(at, `@${name}`, `not an xs:dateTime: "${raw}"`);
  return t;
}

function units(at: Where, parent: XmlNode, name: string): string {
  const node = parent[name];
  if (node === undefined) fail(at, name, 'required element is missing');
  const n = textOf(isNode(node) ? node['Name'] : undefined);
  if (n === undefined || n === '') fail(at, `${name}/Name`, 'required element is missing');
  return n;
}

function gain(at: Where, node: XmlNode): Gain {
  const g = { ...at, node };
  return { value: reqNumber(g, 'Value'), frequency: reqNumber(g, 'Frequency') };
}

function complexList(at: Where, node: XmlNode, name: 'Zero' | 'Pole'): Complex[] {
  return asArray(node[name]).map((v, i) => {
    const here = enter(at, name, v, attr(v, 'number') ?? String(i));
    if (!isNode(v)) fail(here, null, 'Real and Imaginary are required');
    return { re: reqNumber({ ...here, node: v }, 'Real'), im: reqNumber({ ...here, node: v }, 'Imaginary') };
  });
}

function numberList(at: Where, node: XmlNode, name: string): number[] {
  return asArray(node[name]).map((v, i) => parseNumber(at, `${name}[${i + 1}]`, textOf(v) ?? ''));
}

const PZ_TYPES: readonly PzTransferFunction[] = ['LAPLACE (RADIANS/SECOND)', 'LAPLACE (HERTZ)', 'DIGITAL (Z-TRANSFORM)'];
const CF_TYPES: readonly CfTransferFunction[] = ['ANALOG (RADIANS/SECOND)', 'ANALOG (HERTZ)', 'DIGITAL'];

function oneOf<T extends string>(at: Where, name: string, allowed: readonly T[]): T {
  const raw = textOf(at.node[name]);
  if (raw === undefined) fail(at, name, 'required element is missing');
  const found = allowed.find((a) => a === raw.toUpperCase());
  if (!found) fail(at, name, `"${raw}" is not one of ${allowed.map((a) => `"${a}"`).join(', ')}`);
  return found;
}

function stage(at: Where, node: XmlNode, index: number): ResponseStage {
  const numberRaw = attr(node, 'number');
  const here = enter(at, 'Stage', node, numberRaw ?? String(index + 1));
  const number = numberRaw === undefined ? index + 1 : parseNumber(here, '@number', numberRaw);
  let filter: StageFilter | null = null;
  let filterNode: XmlNode | null = null;
  let filterAt = here;
  const kinds = ['PolesZeros', 'Coefficients', 'FIR', 'ResponseList', 'Polynomial'].filter((k) => node[k] !== undefined);
  if (kinds.length > 1) fail(here, null, `a stage holds one filter, found ${kinds.join(' and ')}`);
  if (kinds.length === 1) {
    const kind = kinds[0];
    const raw = node[kind];
    filterNode = isNode(raw) ? raw : {};
    filterAt = enter(here, kind, filterNode);
    const f = filterAt;
    if (kind === 'PolesZeros') {
      filter = {
        kind: 'polesZeros',
        transferFunction: oneOf(f, 'PzTransferFunctionType', PZ_TYPES),
        normalizationFactor: optNumber(f, 'NormalizationFactor') ?? 1,
        normalizationFrequency: reqNumber(f, 'NormalizationFrequency'),
        zeros: complexList(f, filterNode, 'Zero'),
        poles: complexList(f, filterNode, 'Pole'),
      };
    } else if (kind === 'Coefficients') {
      filter = {
        kind: 'coefficients',
        transferFunction: oneOf(f, 'CfTransferFunctionType', CF_TYPES),
        numerator: numberList(f, filterNode, 'Numerator'),
        denominator: numberList(f, filterNode, 'Denominator'),
      };
    } else if (kind === 'FIR') {
      filter = {
        kind: 'fir',
        symmetry: oneOf(f, 'Symmetry', ['NONE', 'EVEN', 'ODD'] as const),
        coefficients: numberList(f, filterNode, 'NumeratorCoefficient'),
      };
    } else if (kind === 'ResponseList') {
      filter = {
        kind: 'responseList',
        points: asArray(filterNode['ResponseListElement']).map((v, i) => {
          const p = enter(f, 'ResponseListElement', v, String(i + 1));
          const pn = { ...p, node: isNode(v) ? v : {} };
          return { frequency: reqNumber(pn, 'Frequency'), amplitude: reqNumber(pn, 'Amplitude'), phase: reqNumber(pn, 'Phase') };
        }),
      };
    } else {
      filter = { kind: 'polynomial', coefficients: numberList(f, filterNode, 'Coefficient') };
    }
  }
  let decimation: Decimation | null = null;
  if (node['Decimation'] !== undefined) {
    const d = enter(here, 'Decimation', node['Decimation']);
    const dn = { ...d, node: isNode(node['Decimation']) ? node['Decimation'] : {} };
    decimation = {
      inputSampleRate: reqNumber(dn, 'InputSampleRate'),
      factor: reqNumber(dn, 'Factor'),
      offset: reqNumber(dn, 'Offset'),
      delay: reqNumber(dn, 'Delay'),
      correction: reqNumber(dn, 'Correction'),
    };
  }
  const g = node['StageGain'];
  return {
    number,
    inputUnits: filterNode ? units(filterAt, filterNode, 'InputUnits') : null,
    outputUnits: filterNode ? units(filterAt, filterNode, 'OutputUnits') : null,
    filter,
    decimation,
    gain: g === undefined ? null : gain(enter(here, 'StageGain', g), isNode(g) ? g : {}),
  };
}

function sensitivity(at: Where, node: XmlNode): Sensitivity {
  const g = gain(at, node);
  return {
    value: g.value,
    frequency: g.frequency,
    inputUnits: units(at, node, 'InputUnits'),
    outputUnits: units(at, node, 'OutputUnits'),
    sign: g.value < 0 ? -1 : 1,
  };
}

function channel(at: Where, network: string, station: string, node: XmlNode): ChannelMeta {
  const code = attr(node, 'code');
  const location = attr(node, 'locationCode');
  const here = enter(at, 'Channel', node, `${location ?? ''}.${code ?? ''}`);
  if (code === undefined || code.trim() === '') fail(here, '@code', 'required attribute is missing');
  if (location === undefined) fail(here, '@locationCode', 'required attribute is missing');
  const n = { ...here, node };
  const azimuth = optNumber(n, 'Azimuth');
  const dip = optNumber(n, 'Dip');
  let sampleRate = optNumber(n, 'SampleRate') ?? null;
  if (sampleRate === null && isNode(node['SampleRateRatio'])) {
    const r = { ...enter(here, 'SampleRateRatio', node['SampleRateRatio']), node: node['SampleRateRatio'] };
    const seconds = reqNumber(r, 'NumberSeconds');
    sampleRate = seconds === 0 ? null : reqNumber(r, 'NumberSamples') / seconds;
  }
  if (sampleRate !== null && sampleRate < 0) fail(n, 'SampleRate', `${sampleRate} is negative`);
  const sensorNode = node['Sensor'];
  const sensor = isNode(sensorNode) ? optText(sensorNode, 'Description') ?? optText(sensorNode, 'Model') : undefined;
  let sens: Sensitivity | undefined;
  const stages: ResponseStage[] = [];
  const resp = node['Response'];
  if (isNode(resp)) {
    const r = enter(here, 'Response', resp);
    const s = resp['InstrumentSensitivity'];
    if (s !== undefined) sens = sensitivity(enter(r, 'InstrumentSensitivity', s), isNode(s) ? s : {});
    asArray(resp['Stage']).forEach((st, i) => {
      stages.push(stage(r, isNode(st) ? st : {}, i));
    });
  }
  return {
    id: { network, station, location: location.trim(), channel: code.trim() },
    start: dateAttr(n, 'startDate', false),
    end: dateAttr(n, 'endDate', true),
    latitude: inRange(n, 'Latitude', reqNumber(n, 'Latitude'), -90, 90),
    longitude: inRange(n, 'Longitude', reqNumber(n, 'Longitude'), -180, 180),
    elevation: distance(n, 'Elevation'),
    depth: distance(n, 'Depth'),
    azimuth: azimuth === undefined ? null : ((inRange(n, 'Azimuth', azimuth, -360, 360) % 360) + 360) % 360,
    dip: dip === undefined ? null : inRange(n, 'Dip', dip, -90, 90),
    sampleRate,
    ...(sensor === undefined ? {} : { sensor }),
    ...(sens === undefined ? {} : { sensitivity: sens }),
    stages,
  };
}

function stationOf(at: Where, network: string, node: XmlNode): StationMeta {
  const code = attr(node, 'code');
  const here = enter(at, 'Station', node, code);
  if (code === undefined || code.trim() === '') fail(here, '@code', 'required attribute is missing');
  const n = { ...here, node };
  const site = isNode(node['Site']) ? optText(node['Site'], 'Name') : undefined;
  return {
    code: code.trim(),
    start: dateAttr(n, 'startDate', false),
    end: dateAttr(n, 'endDate', true),
    latitude: inRange(n, 'Latitude', reqNumber(n, 'Latitude'), -90, 90),
    longitude: inRange(n, 'Longitude', reqNumber(n, 'Longitude'), -180, 180),
    elevation: distance(n, 'Elevation'),
    ...(site === undefined ? {} : { site }),
    channels: asArray(node['Channel']).map((c) => channel(here, network, code.trim(), isNode(c) ? c : {})),
  };
}

function networkOf(at: Where, node: XmlNode): NetworkMeta {
  const code = attr(node, 'code');
  const here = enter(at, 'Network', node, code);
  if (code === undefined || code.trim() === '') fail(here, '@code', 'required attribute is missing');
  const n = { ...here, node };
  const description = optText(node, 'Description');
  return {
    code: code.trim(),
    ...(description === undefined ? {} : { description }),
    start: dateAttr(n, 'startDate', false),
    end: dateAttr(n, 'endDate', true),
    stations: asArray(node['Station']).map((s) => stationOf(here, code.trim(), isNode(s) ? s : {})),
  };
}

const parser = formatXmlParser(REPEATED, { captureMetaData: true });

/**
 * Reads a StationXML document.
 * @param text the document (UTF-8 decoded)
 * @param fileName used in error messages only
 * @throws StationXmlError for malformed XML, a root that is not FDSNStationXML, a schema version
 *   other than 1.x, or a missing or malformed element that Daybreak needs
 */
export function parseStationXml(text: string, fileName: string): Inventory {
  if (typeof text !== 'string') throw new TypeError(`StationXML text must be a string, got ${typeof text}`);
  const valid = XMLValidator.validate(text);
  if (valid !== true) {
    throw new StationXmlError(fileName, valid.err.line, '/', `malformed XML: ${valid.err.msg} (column ${valid.err.col})`);
  }
  const doc = parser.parse(text) as XmlNode;
  const root = doc['FDSNStationXML'];
  const top: Where = { file: fileName, text, path: '', node: doc };
  if (!isNode(root)) {
    const found = Object.keys(doc).filter((k) => !k.startsWith('#'));
    fail(top, null, `root element must be FDSNStationXML, found ${found.length ? found.join(', ') : 'none'}`);
  }
  const at = enter(top, 'FDSNStationXML', root);
  const version = attr(root, 'schemaVersion')?.trim() ?? null;
  if (version !== null && !/^1(\.\d+)?$/.test(version)) {
    fail(at, '@schemaVersion', `schema version ${version} is not read (StationXML 1.0, 1.1 and 1.2 are)`);
  }
  const r = { ...at, node: root };
  const createdRaw = textOf(root['Created']);
  let created: Micros | null = null;
  if (createdRaw !== undefined && createdRaw !== '') {
    const t = parseXsDateTime(createdRaw);
    if (t === undefined || t === null) fail(r, 'Created', `not an xs:dateTime: "${createdRaw}"`);
    created = t;
  }
  const source = optText(root, 'Source');
  const sender = optText(root, 'Sender');
  const module = optText(root, 'Module');
  return {
    schemaVersion: version,
    ...(source === undefined ? {} : { source }),
    ...(sender === undefined ? {} : { sender }),
    ...(module === undefined ? {} : { module }),
    created,
    networks: asArray(root['Network']).map((nw) => networkOf(at, isNode(nw) ? nw : {})),
  };
}
