import { describe, expect, it } from 'vitest';
import { jsonErrorOffset } from '../../../src/board/json-error-position.js';

// Reference: V8's JSON.parse, which names the offset in many (not all) of its messages.
function v8Offset(text: string): number | undefined | 'valid' {
  try {
    JSON.parse(text);
    return 'valid';
  } catch (error) {
    const match = /at position (\d+)/.exec((error as Error).message);
    return match ? Number(match[1]) : undefined;
  }
}

const SAMPLES = [
  '{"a": 1}',
  '[1, 2.5e-3, "x\\u00b5", true, false, null, {"b": []}]',
  '{"a": 1,}',
  '{"a": 1 "b": 2}',
  '{"a": [1, 2}',
  '{"a": tru}',
  '[1, 2] x',
  '{"a": "\\q"}',
  '{"a": 01}',
  '{a: 1}',
  '["abc',
  '',
  '{"a": -}',
  '{"a": 1.}',
  '{"a": 1e}',
  '["a\tb"]',
];

describe('jsonErrorOffset', () => {
  for (const text of SAMPLES) {
    it(JSON.stringify(text), () => {
      const reference = v8Offset(text);
      const ours = jsonErrorOffset(text);
      if (reference === 'valid') expect(ours).toBeUndefined();
      else {
        expect(ours).toBeTypeOf('number');
        if (reference !== undefined) expect(ours).toBe(reference);
      }
    });
  }
});
