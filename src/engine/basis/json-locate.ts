/**
 * Locate a value inside JSON text by its path (keys and array indices), to report
 * line and column for errors in user-supplied files. The text must be valid JSON.
 */
export function locateJsonPath(text: string, path: (string | number)[]): number | undefined {
  let i = 0;
  const ws = () => {
    while (i < text.length && /\s/.test(text[i])) i++;
  };
  const str = (): string => {
    const start = i;
    i++; // opening quote
    while (i < text.length && text[i] !== '"') i += text[i] === "\\" ? 2 : 1;
    i++;
    return JSON.parse(text.slice(start, i)) as string;
  };
  const skip = (): void => {
    ws();
    const c = text[i];
    if (c === '"') str();
    else if (c === "{" || c === "[") {
      const close = c === "{" ? "}" : "]";
      i++;
      ws();
      if (text[i] === close) {
        i++;
        return;
      }
      for (;;) {
        if (c === "{") {
          ws();
          str();
          ws();
          i++; // colon
        }
        skip();
        ws();
        if (text[i++] === close) return;
      }
    } else while (i < text.length && !/[\s,\]}]/.test(text[i])) i++;
  };
  // descend
  for (const seg of path) {
    ws();
    const c = text[i];
    if (c === "{" && typeof seg === "string") {
      i++;
      let found = false;
      ws();
      while (text[i] !== "}") {
        ws();
        const key = str();
        ws();
        i++; // colon
        if (key === seg) {
          found = true;
          break;
        }
        skip();
        ws();
        if (text[i] === ",") i++;
        ws();
      }
      if (!found) return undefined;
    } else if (c === "[" && typeof seg === "number") {
      i++;
      for (let k = 0; k < seg; k++) {
        skip();
        ws();
        if (text[i] !== ",") return undefined;
        i++;
      }
      ws();
      if (text[i] === "]") return undefined;
    } else return undefined;
  }
  ws();
  return i;
}

/** 1-based line and column of a character offset. */
export function lineColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let last = -1;
  for (let k = 0; k < offset && k < text.length; k++) {
    if (text[k] === "\n") {
      line++;
      last = k;
    }
  }
  return { line, column: offset - last };
}

/**
 * Offset and description of the first JSON syntax error in `text` (a small strict scanner,
 * so that the location does not depend on the JavaScript engine's error messages), or
 * undefined when the text is valid JSON.
 */
export function findJsonSyntaxError(text: string): { offset: number; message: string } | undefined {
  let i = 0;
  class Stop {
    offset: number;
    message: string;
    constructor(offset: number, message: string) {
      this.offset = offset;
      this.message = message;
    }
  }
  const ws = () => {
    while (i < text.length && " \t\n\r".includes(text[i])) i++;
  };
  const expectChar = (c: string, what: string) => {
    ws();
    if (text[i] !== c) throw new Stop(i, `expected ${what}`);
    i++;
  };
  const str = () => {
    if (text[i] !== '"') throw new Stop(i, "expected a string in double quotes");
    i++;
    while (i < text.length && text[i] !== '"') {
      const c = text.charCodeAt(i);
      if (c < 0x20) throw new Stop(i, "control character in string");
      if (text[i] === "\\") {
        const e = text[i + 1];
        if (e === "u") {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6))) throw new Stop(i, "bad \\u escape");
          i += 6;
          continue;
        }
        if (!e || !'"\\/bfnrt'.includes(e)) throw new Stop(i, "bad escape in string");
        i += 2;
        continue;
      }
      i++;
    }
    if (i >= text.length) throw new Stop(i, "unterminated string");
    i++;
  };
  const value = (): void => {
    ws();
    const c = text[i];
    if (c === "{") {
      i++;
      ws();
      if (text[i] === "}") {
        i++;
        return;
      }
      for (;;) {
        ws();
        str();
        expectChar(":", '":"');
        value();
        ws();
        if (text[i] === ",") {
          i++;
          continue;
        }
        if (text[i] === "}") {
          i++;
          return;
        }
        throw new Stop(i, 'expected "," or "}"');
      }
    }
    if (c === "[") {
      i++;
      ws();
      if (text[i] === "]") {
        i++;
        return;
      }
      for (;;) {
        value();
        ws();
        if (text[i] === ",") {
          i++;
          continue;
        }
        if (text[i] === "]") {
          i++;
          return;
        }
        throw new Stop(i, 'expected "," or "]"');
      }
    }
    if (c === '"') return str();
    const m = /^(-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?|true|false|null)/.exec(text.slice(i, i + 400));
    if (!m) throw new Stop(i, i >= text.length ? "unexpected end of text" : `unexpected ${JSON.stringify(text[i])}`);
    i += m[0].length;
  };
  try {
    value();
    ws();
    if (i < text.length) throw new Stop(i, "unexpected text after the end of the JSON value");
  } catch (e) {
    if (e instanceof Stop) return { offset: e.offset, message: e.message };
    throw e;
  }
  return undefined;
}
