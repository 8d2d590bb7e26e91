// JSON.parse does not always say where it failed (V8 names the bad token but not its offset), so this
// walks the text just far enough to find the offset of the first character that cannot belong there.

/** Offset of the first syntax error in `text`, or undefined if the text is valid JSON. */
export function jsonErrorOffset(text: string): number | undefined {
  let at = 0;
  const fail = (): never => {
    throw at;
  };
  const space = () => {
    while (at < text.length && ' \t\r\n'.includes(text[at])) at++;
  };
  const literal = (word: string) => {
    for (const ch of word) {
      if (text[at] !== ch) fail();
      at++;
    }
  };
  const string = () => {
    at++; // opening quote
    while (at < text.length && text[at] !== '"') {
      const code = text.charCodeAt(at);
      if (code < 0x20) fail();
      if (text[at] === '\\') {
        at++;
        if (text[at] === 'u') {
          for (let i = 0; i < 4; i++) {
            at++;
            if (!/[0-9a-fA-F]/.test(text[at] ?? '')) fail();
          }
        } else if (!'"\\/bfnrt'.includes(text[at] ?? 'x')) fail();
      }
      at++;
    }
    if (at >= text.length) fail();
    at++;
  };
  const digits = (atLeastOne: boolean) => {
    if (atLeastOne && !/[0-9]/.test(text[at] ?? '')) fail();
    while (/[0-9]/.test(text[at] ?? '')) at++;
  };
  const number = () => {
    if (text[at] === '-') at++;
    if (text[at] === '0') at++;
    else digits(true);
    if (text[at] === '.') {
      at++;
      digits(true);
    }
    if (text[at] === 'e' || text[at] === 'E') {
      at++;
      if (text[at] === '+' || text[at] === '-') at++;
      digits(true);
    }
  };
  const value = (): void => {
    space();
    const ch = text[at];
    if (ch === '{') {
      at++;
      space();
      if (text[at] === '}') return void at++;
      for (;;) {
        space();
        if (text[at] !== '"') fail();
        string();
        space();
        if (text[at] !== ':') fail();
        at++;
        value();
        space();
        if (text[at] === ',') at++;
        else if (text[at] === '}') return void at++;
        else fail();
      }
    }
    if (ch === '[') {
      at++;
      space();
      if (text[at] === ']') return void at++;
      for (;;) {
        value();
        space();
        if (text[at] === ',') at++;
        else if (text[at] === ']') return void at++;
        else fail();
      }
    }
    if (ch === '"') return string();
    if (ch === 't') return literal('true');
    if (ch === 'f') return literal('false');
    if (ch === 'n') return literal('null');
    if (ch === '-' || (ch >= '0' && ch <= '9')) return number();
    fail();
  };
  try {
    value();
    space();
    if (at < text.length) fail();
    return undefined;
  } catch (offset) {
    if (typeof offset === 'number') return offset;
    throw offset;
  }
}
