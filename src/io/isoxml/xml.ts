/**
 * Plain XML for ISO 11783-10 task data: elements with attributes and children, no text content.
 * Writing and reading go through fast-xml-parser; reading refuses any document type declaration and
 * never expands an entity beyond the five predefined ones and character references, so no external
 * entity is ever resolved and no entity-expansion attack can grow the document.
 */
import { XMLBuilder, XMLParser, XMLValidator } from 'fast-xml-parser';
import { UserError } from '../../errors.js';

/** One element: tag, attributes in writing order, child elements. */
export interface XmlElement {
  tag: string;
  attrs: Record<string, string>;
  children: XmlElement[];
}

/** Shorthand for building an element; attributes that are undefined are left out. */
export function el(
  tag: string,
  attrs: Record<string, string | number | undefined>,
  children: XmlElement[] = [],
): XmlElement {
  const a: Record<string, string> = {};
  for (const [k, v] of Object.entries(attrs)) if (v !== undefined) a[k] = String(v);
  return { tag, attrs: a, children };
}

type Ordered = Record<string, unknown>;

function toOrdered(e: XmlElement): Ordered {
  const o: Ordered = { [e.tag]: e.children.map(toOrdered) };
  if (Object.keys(e.attrs).length) o[':@'] = e.attrs;
  return o;
}

/** Control characters (tabs, line breaks included) would be folded or refused by readers: spaces instead. */
const clean = (s: string) => s.replace(/[\u0000-\u001f\u007f]/g, ' ');

/**
 * Serializes a document: XML declaration (UTF-8), one element per line, attribute values escaped
 * (`& < > " '`), control characters in values replaced by spaces.
 * @example writeXml(el('ROOT', { A: 'x & y' })) // '<?xml version="1.0" encoding="UTF-8"?>\n<ROOT A="x &amp; y"/>\n'
 */
export function writeXml(root: XmlElement): string {
  const sanitize = (e: XmlElement): XmlElement => ({
    tag: e.tag,
    attrs: Object.fromEntries(Object.entries(e.attrs).map(([k, v]) => [k, clean(v)])),
    children: e.children.map(sanitize),
  });
  const b = new XMLBuilder({
    preserveOrder: true,
    ignoreAttributes: false,
    attributeNamePrefix: '',
    format: true,
    indentBy: ' ',
    suppressEmptyNode: true,
  });
  const decl = { '?xml': [], ':@': { version: '1.0', encoding: 'UTF-8' } };
  return (b.build([decl, toOrdered(sanitize(root))]) as string).replace(/^\s+/, '') + '\n';
}

const PREDEFINED: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };

/** Decodes the predefined entities and character references; any other entity is refused. */
function decodeValue(v: string, label: string, where: string): string {
  return v.replace(/&(#x[0-9a-fA-F]+|#[0-9]+|[A-Za-z_][\w.-]*);/g, (m, name: string) => {
    if (name[0] === '#') {
      const code = name[1] === 'x' ? parseInt(name.slice(2), 16) : parseInt(name.slice(1), 10);
      if (code > 0 && code <= 0x10ffff) return String.fromCodePoint(code);
    } else if (name in PREDEFINED) return PREDEFINED[name];
    throw new UserError(
      `${label}: ${where} uses the entity "${m}", which is not defined; task data uses only the five predefined XML entities. Fix: write the character itself (UTF-8), or export the task data again.`,
      { file: label, where, value: m },
    );
  });
}

function fromOrdered(node: Ordered, label: string, path: string): XmlElement | null {
  const tag = Object.keys(node).find((k) => k !== ':@');
  if (!tag || tag.startsWith('?') || tag === '#text' || tag === '#comment') return null;
  const where = path ? `${path} > ${tag}` : tag;
  const raw = (node[':@'] ?? {}) as Record<string, unknown>;
  const attrs: Record<string, string> = {};
  for (const [k, v] of Object.entries(raw))
    attrs[k] = decodeValue(String(v), label, `element ${where} attribute ${k}`);
  const kids = (node[tag] ?? []) as Ordered[];
  const children: XmlElement[] = [];
  for (const k of kids) {
    const c = fromOrdered(k, label, where);
    if (c) children.push(c);
  }
  return { tag, attrs, children };
}

/**
 * Parses an XML document into elements. Refuses (UserError naming `label`, line and column) a document
 * that is not well formed (a truncated file, an unclosed element), one with a DOCTYPE (task data has none;
 * it is where entity attacks live), and any entity other than the five predefined ones.
 *
 * @param text the document
 * @param label file name for messages
 * @example parseXml('<ISO11783_TaskData VersionMajor="4"/>', 'TASKDATA.XML').attrs.VersionMajor // '4'
 */
export function parseXml(text: string, label: string): XmlElement {
  const body = text.replace(/^\uFEFF/, '');
  const dt = /<!DOCTYPE|<!ENTITY/i.exec(body);
  if (dt) {
    const line = body.slice(0, dt.index).split('\n').length;
    throw new UserError(
      `${label} line ${line}: has a DOCTYPE or ENTITY declaration; task data never needs one and tilth does not read documents that declare entities (they can point at other files or expand without end). Fix: export the task data again from the program that made it, without a DOCTYPE.`,
      { file: label, where: `line ${line}` },
    );
  }
  const rootTag = /<([A-Za-z_][\w.-]*)/.exec(body.replace(/<\?[\s\S]*?\?>/g, ''))?.[1];
  const closed =
    rootTag !== undefined &&
    (new RegExp(`</${rootTag}\\s*>\\s*$`).test(body) || /^\s*(<\?[\s\S]*?\?>\s*)?<[^<>]*\/>\s*$/.test(body));
  if (rootTag && !closed) {
    const lines = body.trimEnd().split('\n').length;
    throw new UserError(
      `${label} line ${lines}: not well-formed XML: the file ends before its root element ${rootTag} is closed (</${rootTag}> is missing): it is cut short. Fix: copy the file again from its source, or export the task data again.`,
      { file: label, where: rootTag },
    );
  }
  const v = XMLValidator.validate(body, { allowBooleanAttributes: false });
  if (v !== true) {
    throw new UserError(
      `${label} line ${v.err.line}, column ${v.err.col}: not well-formed XML: ${v.err.msg}. Fix: copy the file again from its source, or export the task data again.`,
      { file: label, where: `line ${v.err.line}` },
    );
  }
  const p = new XMLParser({
    preserveOrder: true,
    ignoreAttributes: false,
    attributeNamePrefix: '',
    processEntities: false,
    htmlEntities: false,
    parseAttributeValue: false,
    parseTagValue: false,
    trimValues: true,
  });
  const nodes = p.parse(body) as Ordered[];
  const roots = nodes.map((n) => fromOrdered(n, label, '')).filter((e): e is XmlElement => e !== null);
  if (roots.length !== 1)
    throw new UserError(
      `${label}: expected one root element, found ${roots.length}. Fix: give a TASKDATA.XML file.`,
      { file: label },
    );
  return roots[0];
}
