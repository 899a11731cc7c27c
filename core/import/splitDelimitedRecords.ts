/**
 * Splits decoded text (the sniffed head of a capture file) into records and fields.
 *
 * Follows RFC 4180 §2: fields are separated by the delimiter, records by CRLF (here also LF or a
 * lone CR); a field enclosed in double quotes may contain the delimiter, line breaks and doubled
 * double quotes (`""` stands for one `"`). Lenient where the RFC is silent: blanks around a
 * quoted field are ignored, text after the closing quote is kept, an unterminated quote runs to
 * the end of the text. With the space delimiter, runs of blanks count as one separator and
 * leading/trailing blanks are ignored.
 */
export interface TextRecord {
  /** Field texts, unquoted; unquoted fields are trimmed of blanks. */
  readonly fields: string[];
  /** Whether each field was quoted. */
  readonly quoted: boolean[];
  /** 1-based physical line number where the record starts. */
  readonly line: number;
  /** Number of physical lines the record spans (more than 1 when a quoted field holds a line break). */
  readonly lineSpan: number;
  /** Whether the record ended with a line break (false for an unterminated last line). */
  readonly terminated: boolean;
}

export function splitDelimitedRecords(text: string, delimiter: string): TextRecord[] {
  const records: TextRecord[] = [];
  const d = delimiter.charCodeAt(0);
  const collapse = delimiter === ' ';
  const n = text.length;
  let p = 0;
  let line = 1;
  while (p < n) {
    const startLine = line;
    const fields: string[] = [];
    const quoted: boolean[] = [];
    let terminated = false;
    if (collapse) while (p < n && text.charCodeAt(p) === 32) p++;
    for (;;) {
      // One field.
      let q = p;
      while (q < n && (text.charCodeAt(q) === 32 || text.charCodeAt(q) === 9) && text.charCodeAt(q) !== d) q++;
      let value = '';
      let wasQuoted = false;
      if (q < n && text.charCodeAt(q) === 34) {
        wasQuoted = true;
        q++;
        let segStart = q;
        for (;;) {
          if (q >= n) { value += text.slice(segStart, q); break; }
          const c = text.charCodeAt(q);
          if (c === 34) {
            if (q + 1 < n && text.charCodeAt(q + 1) === 34) {
              value += text.slice(segStart, q + 1);
              q += 2;
              segStart = q;
              continue;
            }
            value += text.slice(segStart, q);
            q++;
            break;
          }
          if (c === 10 || c === 13) {
            if (c === 13 && q + 1 < n && text.charCodeAt(q + 1) === 10) q++;
            line++;
          }
          q++;
        }
        const tailStart = q;
        while (q < n) {
          const c = text.charCodeAt(q);
          if (c === d || c === 10 || c === 13) break;
          q++;
        }
        value += text.slice(tailStart, q).trim();
      } else {
        const fieldStart = q;
        while (q < n) {
          const c = text.charCodeAt(q);
          if (c === d || c === 10 || c === 13) break;
          q++;
        }
        value = text.slice(fieldStart, q).trim();
      }
      fields.push(value);
      quoted.push(wasQuoted);
      p = q;
      if (p < n && text.charCodeAt(p) === d) {
        p++;
        if (collapse) {
          while (p < n && text.charCodeAt(p) === 32) p++;
          if (p >= n || text.charCodeAt(p) === 10 || text.charCodeAt(p) === 13) {
            // trailing blanks: not another field
          } else continue;
        } else continue;
      }
      break;
    }
    if (p < n) {
      const c = text.charCodeAt(p);
      if (c === 13 && p + 1 < n && text.charCodeAt(p + 1) === 10) p += 2;
      else p++;
      terminated = true;
      line++;
    }
    records.push({ fields, quoted, line: startLine, lineSpan: line - startLine + (terminated ? 0 : 1), terminated });
  }
  return records;
}
