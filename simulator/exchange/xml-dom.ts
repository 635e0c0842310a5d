/**
 * Untrusted XML in, a small namespaced tree out — with the guards an import from a file
 * needs. fast-xml-parser does not resolve namespaces and (with `preserveOrder: false`)
 * groups siblings by name, losing the interleaving of `block`, `inVariable` and
 * `outVariable` that carries the sheet's block order; so it runs with `preserveOrder: true`
 * (every child list is an array — the job `isArray` does otherwise) and this module
 * resolves prefixes against the `xmlns` declarations in scope.
 *
 * Guards: a size cap in characters and in tags (checked before any tree is built); no
 * DOCTYPE at all, so no entity can be declared or expanded; entity processing in the
 * parser is off and only the five predefined entities and numeric character references are
 * decoded here; nesting is capped by the parser (`maxNestedTags`); names the parser deems
 * dangerous (`__proto__`, …) fail the parse instead of reaching an object.
 */
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import type { Problem, Result } from '@/simulator/shared/result';

/** One element: local name, namespace URI (`''` for none), attributes by (qualified) name, children, text. */
export type XmlNode = { name: string; ns: string; attrs: Record<string, string>; children: XmlNode[]; text: string };

/** Limits of an XML import; raise them only for trusted files. */
export type XmlLimits = {
  /** Most characters in the document. */
  maxChars: number;
  /** Most tags (start, end, empty, declarations) in the document. */
  maxTags: number;
  /** Deepest element nesting. */
  maxDepth: number;
};

const PREDEFINED: Record<string, string> = { lt: '<', gt: '>', amp: '&', quot: '"', apos: "'" };

type Raw = Record<string, unknown>;

/** Counts `<` without building anything, so an oversized document is refused cheaply. */
function countTags(xml: string, cap: number): number {
  let n = 0;
  for (let i = xml.indexOf('<'); i !== -1 && n <= cap; i = xml.indexOf('<', i + 1)) n++;
  return n;
}

/** Parses and checks a document; every problem has a path starting `['xml']`. */
export function parseXml(xml: unknown, limits: XmlLimits): Result<XmlNode, Problem> {
  const fail = (code: string, message: string, path: (string | number)[] = ['xml']): Result<XmlNode, Problem> => ({ ok: false, errors: [{ path, code, message }] });
  if (typeof xml !== 'string') return fail('invalid_type', 'the document must be text');
  if (xml.length > limits.maxChars) return fail('too_large', `the document has ${xml.length} characters; at most ${limits.maxChars} are accepted`);
  if (/<!DOCTYPE|<!ENTITY/i.test(xml)) return fail('doctype_forbidden', 'DOCTYPE and entity declarations are not accepted (no entity expansion)');
  if (countTags(xml, limits.maxTags) > limits.maxTags) return fail('too_large', `the document has more than ${limits.maxTags} tags`);
  const valid = XMLValidator.validate(xml);
  if (valid !== true) {
    const { line, col, msg } = valid.err;
    return fail('malformed_xml', `not well-formed XML: ${msg}`, ['xml', 'line', line, ...(col === undefined ? [] : ['column', col])]);
  }
  let raw: unknown[];
  try {
    const parser = new XMLParser({
      preserveOrder: true,
      ignoreAttributes: false,
      attributeNamePrefix: '',
      parseTagValue: false,
      parseAttributeValue: false,
      trimValues: false,
      processEntities: false,
      cdataPropName: '#cdata',
      maxNestedTags: limits.maxDepth,
    });
    raw = parser.parse(xml) as unknown[];
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    // The parser enforces the depth cap by throwing; report it as the limit it is.
    if (/nested/i.test(message)) return fail('too_large', `elements are nested deeper than ${limits.maxDepth} levels`);
    return fail('malformed_xml', `the document cannot be read: ${message}`);
  }
  const roots = raw.filter((r) => elementName(r as Raw) !== undefined);
  if (roots.length !== 1) return fail('malformed_xml', `a document has exactly one root element, not ${roots.length}`);
  const problems: Problem[] = [];
  const root = convert(roots[0] as Raw, { '': '' }, problems, []);
  return problems.length > 0 ? { ok: false, errors: problems } : { ok: true, value: root };
}

/** The element name of a preserve-order entry, or undefined for text, comments and declarations. */
function elementName(entry: Raw): string | undefined {
  return Object.keys(entry).find((k) => k !== ':@' && !k.startsWith('#') && !k.startsWith('?'));
}

function decodeEntities(text: string, problems: Problem[], path: (string | number)[]): string {
  if (!text.includes('&')) return text;
  return text.replace(/&(#x[0-9a-fA-F]+|#[0-9]+|[A-Za-z_][\w.-]*);/g, (whole, body: string) => {
    if (body[0] !== '#') {
      const value = PREDEFINED[body];
      if (value === undefined) problems.push({ path, code: 'unknown_entity', message: `entity ${whole} is not one of XML's predefined entities` });
      return value ?? '';
    }
    const code = body[1] === 'x' ? parseInt(body.slice(2), 16) : parseInt(body.slice(1), 10);
    if (!(code >= 1 && code <= 0x10ffff) || (code >= 0xd800 && code <= 0xdfff)) {
      problems.push({ path, code: 'malformed_xml', message: `character reference ${whole} names no character` });
      return '';
    }
    return String.fromCodePoint(code);
  });
}

function convert(entry: Raw, scope: Record<string, string>, problems: Problem[], parentPath: string[]): XmlNode {
  const qname = elementName(entry) as string;
  const path = [...parentPath, qname];
  const rawAttrs = (entry[':@'] ?? {}) as Record<string, string>;
  const inner: Record<string, string> = { ...scope };
  const attrs: Record<string, string> = {};
  for (const [key, value] of Object.entries(rawAttrs)) {
    const decoded = decodeEntities(String(value), problems, ['xml', ...path, `@${key}`]);
    if (key === 'xmlns') inner[''] = decoded;
    else if (key.startsWith('xmlns:')) inner[key.slice(6)] = decoded;
    else attrs[key] = decoded;
  }
  const colon = qname.indexOf(':');
  const prefix = colon < 0 ? '' : qname.slice(0, colon);
  const ns = inner[prefix];
  if (ns === undefined) problems.push({ path: ['xml', ...path], code: 'unbound_prefix', message: `namespace prefix "${prefix}" of <${qname}> is not declared` });
  const children: XmlNode[] = [];
  let text = '';
  for (const child of (entry[qname] ?? []) as Raw[]) {
    if (typeof child['#text'] === 'string') text += decodeEntities(child['#text'], problems, ['xml', ...path]);
    else if (Array.isArray(child['#cdata'])) text += (child['#cdata'] as Raw[]).map((c) => String(c['#text'] ?? '')).join('');
    else if (elementName(child) !== undefined) children.push(convert(child, inner, problems, path));
  }
  return { name: colon < 0 ? qname : qname.slice(colon + 1), ns: ns ?? '', attrs, children, text };
}

/** Child elements of `node` with a local name (and namespace, by default the parent's). */
export function childrenNamed(node: XmlNode, name: string, ns: string = node.ns): XmlNode[] {
  return node.children.filter((c) => c.name === name && c.ns === ns);
}

/** The first child element with a local name (and namespace, by default the parent's). */
export function child(node: XmlNode | undefined, name: string, ns?: string): XmlNode | undefined {
  return node ? childrenNamed(node, name, ns ?? node.ns)[0] : undefined;
}
