import { isMap, isScalar, isSeq, type Document, type LineCounter } from 'yaml';

/** One segment of a field path: a field name or a list index. */
export type Seg = string | number;

/** A problem found by a check, before its line and column are looked up. */
export interface RawIssue {
  segs: Seg[];
  message: string;
  /** Point at the field name rather than its value (unknown or duplicate fields) */
  atKey?: boolean;
}

/** `steps[3].limits[0].high`; `(file)` for the document as a whole. */
export function pathString(segs: Seg[]): string {
  let s = '';
  for (const seg of segs) s += typeof seg === 'number' ? `[${seg}]` : `${s ? '.' : ''}${seg}`;
  return s || '(file)';
}

/** Line and column of the node a path names, or of its nearest existing parent when the field is missing. */
export function locate(doc: Document, lc: LineCounter, segs: Seg[], atKey: boolean): { line: number; column: number } {
  let node: unknown = doc.contents;
  let offset = (node as { range?: number[] } | null)?.range?.[0] ?? 0;
  for (let k = 0; k < segs.length; k++) {
    const seg = segs[k];
    if (isMap(node)) {
      const pair = node.items.find((it) => (isScalar(it.key) ? it.key.value : it.key) === seg);
      if (!pair) break;
      const keyOffset = (pair.key as { range?: number[] } | null)?.range?.[0];
      if (k === segs.length - 1 && atKey && keyOffset !== undefined) {
        offset = keyOffset;
        break;
      }
      node = pair.value;
      offset = (node as { range?: number[] } | null)?.range?.[0] ?? keyOffset ?? offset;
    } else if (isSeq(node) && typeof seg === 'number') {
      const item = node.items[seg];
      if (item === undefined) break;
      node = item;
      offset = (item as { range?: number[] } | null)?.range?.[0] ?? offset;
    } else {
      break;
    }
  }
  const pos = lc.linePos(offset);
  return { line: pos.line, column: pos.col };
}
