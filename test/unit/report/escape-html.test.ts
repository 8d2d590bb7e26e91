// Escaping of text put into the page. The five characters & < > " ' are the ones that end text or a
// quoted attribute value in HTML (HTML Living Standard, "escaping a string", from memory; common practice).
import { describe, expect, it } from 'vitest';
import { escapeHtml, html, joinMarkup, trusted } from '../../../src/report/escape-html.js';
import { markerMarkup } from '../../../src/report/svg-markers.js';

describe('escapeHtml', () => {
  it('replaces the five markup characters with entities', () => {
    expect(escapeHtml(`<script>alert("x")</script> & 'y'`)).toBe('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#39;y&#39;');
  });

  it('escapes an ampersand first, so entities in the input stay visible as written', () => {
    expect(escapeHtml('&lt;')).toBe('&amp;lt;');
  });

  it('leaves other text, including non-ASCII, as it is', () => {
    expect(escapeHtml('n1–n2 Ω µH ±5 %')).toBe('n1–n2 Ω µH ±5 %');
  });
});

describe('the html tag', () => {
  it('escapes every interpolated string, in text and in attributes', () => {
    const name = '"><img src=x onerror=alert(1)>';
    const out = html`<td title="${name}">${name}</td>`.text;
    expect(out).not.toContain('<img');
    expect(out).toBe('<td title="&quot;&gt;&lt;img src=x onerror=alert(1)&gt;">&quot;&gt;&lt;img src=x onerror=alert(1)&gt;</td>');
  });

  it('passes fragments it built itself, joins arrays and drops nothing-values', () => {
    const inner = html`<b>${'a<b'}</b>`;
    expect(html`<p>${inner}${[1, '<', null, undefined, false]}</p>`.text).toBe('<p><b>a&lt;b</b>1&lt;</p>');
  });

  it('does not escape our own constant markup marked trusted', () => {
    expect(html`<style>${trusted('a > b { }')}</style>`.text).toBe('<style>a > b { }</style>');
  });

  it('joins with an escaped separator', () => {
    expect(joinMarkup(['x', html`<i>y</i>`], ' & ').text).toBe('x &amp; <i>y</i>');
  });
});

describe('marker attributes', () => {
  it('escapes attribute values and titles from files', () => {
    const m = markerMarkup('circle', 1, 2, 3, 'measured', '<n1>', { 'data-node': '"n1"' }).text;
    expect(m).toContain('data-node="&quot;n1&quot;"');
    expect(m).toContain('<title>&lt;n1&gt;</title>');
  });

  it('refuses attribute names that are not plain words', () => {
    expect(() => markerMarkup('circle', 0, 0, 1, 'x', 't', { 'onload="alert(1)" x': 'y' })).toThrow(/attribute name/);
  });
});
