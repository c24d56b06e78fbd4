import type { VisiblePass } from '@shared/orbit/passes';

function parts(ms: number): [number, number, number, number, number] {
  const d = new Date(ms);
  return [d.getUTCFullYear(), d.getUTCMonth() + 1, d.getUTCDate(), d.getUTCHours(), d.getUTCMinutes()];
}

/**
 * An iCalendar file (RFC 5545) for one pass, made by the `ics` package, loaded only when someone asks for it.
 * Times are UTC in the file; calendars show them in the reader's own zone.
 */
export async function passCalendarFile(opts: { pass: VisiblePass; craftName: string; placeName: string; pageUrl: string }): Promise<Blob> {
  const { createEvent } = await import('ics');
  const { pass } = opts;
  const { error, value } = createEvent({
    uid: `${opts.craftName.toLowerCase().replace(/[^a-z0-9]+/g, '-')}-${Math.round(pass.start.atMs / 1000)}@lightkeel`,
    title: `${opts.craftName} passes over ${opts.placeName}`,
    description:
      `Look ${pass.start.compass} from ${Math.round(pass.start.elevationDeg)}° up; highest ${Math.round(pass.highest.elevationDeg)}° in the ${pass.highest.compass}; ` +
      `gone ${pass.end.compass}. Never look at or near the Sun. Times shift by minutes as the orbit decays: check the newest forecast at ${opts.pageUrl}`,
    start: parts(pass.start.atMs),
    startInputType: 'utc',
    startOutputType: 'utc',
    end: parts(pass.end.atMs + 60_000),
    endInputType: 'utc',
    endOutputType: 'utc',
    url: opts.pageUrl,
    productId: 'lightkeel/sky-watch',
  });
  if (error || !value) throw error ?? new Error('The calendar file could not be made.');
  return new Blob([value], { type: 'text/calendar;charset=utf-8' });
}
