// The *IDN? answer: four comma-separated fields, maker, model, serial number, firmware (IEEE 488.2,
// 10.14 (from memory)). A field the maker does not fill is "0" by the same rule.

import { AnswerError } from './instrument-errors.js';

export interface Identity {
  maker: string;
  model: string;
  serial: string;
  firmware: string;
  /** The answer as received, for matching a profile's identity pattern. */
  raw: string;
}

export function parseIdentity(answer: string, command = '*IDN?'): Identity {
  const fields = answer.split(',');
  if (fields.length !== 4) {
    throw new AnswerError(command, answer, `has ${fields.length} field${fields.length === 1 ? '' : 's'}, expected 4 (maker, model, serial, firmware)`);
  }
  const [maker, model, serial, firmware] = fields.map((f) => f.trim());
  if (maker === '' || model === '') throw new AnswerError(command, answer, 'leaves the maker or the model empty');
  return { maker, model, serial, firmware, raw: answer };
}

/** True when the answer has the shape of an identity (used to find our place again after a timeout). */
export function looksLikeIdentity(answer: string): boolean {
  const fields = answer.split(',');
  return fields.length === 4 && fields[0].trim() !== '' && fields[1].trim() !== '';
}
