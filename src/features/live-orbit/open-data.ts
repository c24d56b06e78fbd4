/** Download links of the craft's element-set history (open data, CCSDS OMM and CSV). */
export function openDataLinks(slug: string) {
  const base = `/api/public/orbit/${encodeURIComponent(slug)}/element-sets`;
  return [
    { href: `${base}.xml`, label: 'OMM XML', description: 'CCSDS 502.0-B-2 Orbit Mean-Elements Messages' },
    { href: `${base}.json`, label: 'OMM JSON', description: 'the same keywords as JSON objects' },
    { href: `${base}.csv`, label: 'CSV', description: 'one row per element set, OMM keywords as the header' },
  ];
}
