/**
 * The one way Daybreak's format readers (StationXML, QuakeML) set up the XML parser library: values
 * kept as text (each reader converts and checks them itself), attributes as `@_name`, namespace
 * prefixes dropped, and the elements in `repeated` always given as lists.
 */
import { XMLParser } from 'fast-xml-parser';

export function formatXmlParser(repeated: ReadonlySet<string>, options: { captureMetaData?: boolean } = {}): XMLParser {
  return new XMLParser({
    ignoreAttributes: false,
    attributeNamePrefix: '@_',
    removeNSPrefix: true,
    parseTagValue: false,
    parseAttributeValue: false,
    ignoreDeclaration: true,
    ignorePiTags: true,
    captureMetaData: options.captureMetaData ?? false,
    isArray: (name) => repeated.has(name),
  });
}
