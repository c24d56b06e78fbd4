import type { ElementSetFormat } from './types';

/** Detects the format from the content (never from a file name). */
export function detectFormat(text: string): ElementSetFormat {
  let i = 0;
  if (text.charCodeAt(0) === 0xfeff) i = 1;
  while (i < text.length && /\s/.test(text[i]!)) i++;
  const c = text[i];
  if (c === undefined) return 'unknown';
  if (c === '<') return 'omm-xml';
  if (c === '[' || c === '{') return 'omm-json';
  const head = text.slice(i, i + 4096);
  const lines = head
    .split('\n')
    .map((l) => l.trim())
    .filter((l) => l !== '' && !l.startsWith('#'));
  const first = lines[0] ?? '';
  if (/^(CCSDS_OMM_VERS|COMMENT|CREATION_DATE|ORIGINATOR|OBJECT_NAME|OBJECT_ID|EPOCH|MEAN_MOTION)\s*=/.test(first)) return 'omm-kvn';
  if (first.includes(',') && /(^|,)\s*"?(EPOCH|MEAN_MOTION|NORAD_CAT_ID|OBJECT_NAME)"?\s*(,|$)/i.test(first)) return 'omm-csv';
  if (lines.slice(0, 4).some((l) => /^[12] /.test(l))) return 'tle';
  return 'unknown';
}
