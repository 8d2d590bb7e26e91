// Writes switch channels as a SCPI channel list, "(@101,103:105)" (SCPI-99 vol. 1, 8.3.2 (from memory)),
// in the style a profile gives: how one channel is written (plain, or slot and channel produced from the
// fixture map's channel number), the separator, and whether consecutive runs become ranges. The order of
// the channels is kept, because ROUTe:CLOSe? answers in list order.

import { renderTemplate, type Template } from './profile-templates.js';

export interface ChannelListStyle {
  /** The whole list around {list}, e.g. "(@{list})". */
  form: Template;
  /** One channel: {n} the channel number, or {slot} and {ch} with n = slot * slotSize + ch. */
  channel: Template;
  slotSize?: number;
  separator: string;
  /** Joins the ends of a run of three or more consecutive channels; undefined writes every channel. */
  range?: string;
}

export function renderChannelList(channels: readonly number[], style: ChannelListStyle): string {
  const items: string[] = [];
  for (let i = 0; i < channels.length; ) {
    let j = i;
    if (style.range !== undefined) {
      while (j + 1 < channels.length && channels[j + 1] === channels[j] + 1 && sameSlot(channels[j], channels[j + 1], style)) j++;
    }
    if (j - i >= 2) {
      items.push(`${one(channels[i], style)}${style.range}${one(channels[j], style)}`);
    } else {
      j = i;
      items.push(one(channels[i], style));
    }
    i = j + 1;
  }
  return renderTemplate(style.form, { list: items.join(style.separator) });
}

function one(n: number, style: ChannelListStyle): string {
  const size = style.slotSize ?? 0;
  const values: Record<string, number> = size > 0 ? { n, slot: Math.floor(n / size), ch: n % size } : { n };
  return renderTemplate(style.channel, values);
}

// A range must not run across a slot boundary: on a slotted matrix that would be a different set.
function sameSlot(a: number, b: number, style: ChannelListStyle): boolean {
  return !style.slotSize || Math.floor(a / style.slotSize) === Math.floor(b / style.slotSize);
}
