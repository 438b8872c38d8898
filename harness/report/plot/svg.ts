// SVG text helpers. Plot markup is assembled from numbers only; the one function that may put
// text into SVG is escapeXml. The text it receives is our own (axis units) or a number, except
// the margin marks' hover titles (plot/margin.ts), which quote acceptance sentences from results.
// SvgMarkup marks strings built this way so templates can inline them.

export type SvgMarkup = string & { readonly __svgFromNumbers: true };

export const asSvg = (markup: string): SvgMarkup => markup as SvgMarkup;

/** A coordinate with one decimal, no "-0", no exponent (px resolution is plenty). */
export function num(value: number): string {
  if (!Number.isFinite(value)) return '0';
  const rounded = Math.round(value * 10) / 10;
  return rounded === 0 ? '0' : String(rounded);
}

const XML_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/** Escapes text for SVG/XML content and attribute values. */
export function escapeXml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => XML_ESCAPES[c]);
}

/** Label text for a number: up to `decimals` decimals, trailing zeros dropped, true minus sign. */
export { label } from '../../files/numberText.js';
