/**
 * Reads a figure as the page shows it ("86.90 kA", "3.378 × 10⁵ m/s²", "0.873 %") back into an SI
 * number, so a browser test can compare what a reader sees with the embedded results.
 */
const SUPERSCRIPT_DIGITS: Record<string, string> = {
  '\u207B': '-', '\u2070': '0', '\u00B9': '1', '\u00B2': '2', '\u00B3': '3',
  '\u2074': '4', '\u2075': '5', '\u2076': '6', '\u2077': '7', '\u2078': '8', '\u2079': '9',
};
const PREFIX: Record<string, number> = { p: 1e-12, n: 1e-9, '\u00B5': 1e-6, m: 1e-3, '': 1, k: 1e3, M: 1e6, G: 1e9 };

export function parseShownFigure(text: string, baseUnit: string): number {
  const clean = text.replace(/\u2009/g, '').replace(/\u00A0/g, ' ').trim();
  const match = /^(-?[\d.]+)(?: \u00D7 10([\u207B\u2070\u00B9\u00B2\u00B3\u2074-\u2079]+))? ?(.*)$/.exec(clean);
  if (!match) throw new Error(`unreadable figure "${text}"`);
  const mantissa = Number(match[1]);
  const exponent = match[2] ? Number([...match[2]].map((c) => SUPERSCRIPT_DIGITS[c] ?? c).join('')) : 0;
  const unit = match[3] ?? '';
  if (unit === '%') return (mantissa * 10 ** exponent) / 100;
  if (!unit.endsWith(baseUnit)) throw new Error(`figure "${text}" is not in ${baseUnit}`);
  const factor = PREFIX[unit.slice(0, unit.length - baseUnit.length)];
  if (factor === undefined) throw new Error(`unknown prefix in "${text}"`);
  return mantissa * 10 ** exponent * factor;
}
