// A strict XML reader for the tests, on the sax parser (strict mode rejects anything not well-formed).
import { createRequire } from 'node:module'

export interface XmlNode { name: string; uri: string; attributes: Record<string, string>; children: XmlNode[]; text: string }

interface SaxTag { local: string; uri: string; attributes: Record<string, { value: string }> }
interface SaxParser {
  onerror: (e: Error) => void; onopentag: (t: SaxTag) => void; onclosetag: () => void; ontext: (t: string) => void
  write(s: string): SaxParser; close(): void
}
const sax = createRequire(import.meta.url)('sax') as { parser(strict: boolean, opts: { xmlns: boolean }): SaxParser }

/** Parses `text`; throws on any well-formedness error. */
export function parseXml(text: string): XmlNode {
  const parser = sax.parser(true, { xmlns: true })
  const stack: XmlNode[] = []
  let root: XmlNode | null = null
  parser.onerror = (e) => { throw e }
  parser.onopentag = (t) => {
    const node: XmlNode = { name: t.local, uri: t.uri, attributes: Object.fromEntries(Object.entries(t.attributes).map(([k, v]) => [k, v.value])), children: [], text: '' }
    if (stack.length) stack[stack.length - 1]!.children.push(node)
    else root = node
    stack.push(node)
  }
  parser.onclosetag = () => { stack.pop() }
  parser.ontext = (t) => { if (stack.length) stack[stack.length - 1]!.text += t }
  parser.write(text).close()
  if (!root) throw new Error('no root element')
  return root
}

export const childrenNamed = (n: XmlNode, name: string) => n.children.filter((c) => c.name === name)
export const childText = (n: XmlNode, name: string) => childrenNamed(n, name)[0]?.text ?? null
