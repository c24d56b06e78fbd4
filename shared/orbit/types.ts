export type ElementSetFormat = 'tle' | 'omm-kvn' | 'omm-xml' | 'omm-json' | 'omm-csv' | 'unknown';

export type ParseError = {
  /** 1-based line in the input where the problem is. */
  line: number;
  /** 1-based inclusive column range, for fixed-column sets. */
  columns?: [number, number];
  /** Field name (TLE field or OMM keyword). */
  field?: string;
  message: string;
  expected?: string;
  /** For a set of another object: what the file says about it, to record it as a spacecraft. */
  object?: { catalogNumber: string; name: string | null; internationalDesignator: string };
};

export type Classification = 'U' | 'C' | 'S';

/**
 * One element set (TLE or OMM record) of an object at an epoch. All numbers are finite.
 * Conventions follow the two-line set as published: `meanMotionDotRevPerDay2` is the line-1 field ṅ/2 and
 * `meanMotionDdotRevPerDay3` is the line-1 field n̈/6 (OMM MEAN_MOTION_DOT / MEAN_MOTION_DDOT use the same).
 */
export type ElementSet = {
  name?: string;
  /** Five characters as in a TLE: zero-padded digits, or alpha-5 (A0000…Z9999) above 99999. */
  catalogNumber: string;
  catalogNumberInt: number;
  classification: Classification;
  /** e.g. "25951C" (TLE) — OMM OBJECT_ID "2025-951C" is converted to this form; may be "". */
  internationalDesignator: string;
  /** ISO 8601 UTC, millisecond precision. */
  epoch: string;
  /** Unix milliseconds, with sub-millisecond fraction kept. */
  epochMs: number;
  /** Kozai mean motion as published [rev/day]. */
  meanMotionRevPerDay: number;
  /** ṅ/2 as published in the TLE (OMM MEAN_MOTION_DOT) [rev/day²]. */
  meanMotionDotRevPerDay2: number;
  /** n̈/6 as published in the TLE (OMM MEAN_MOTION_DDOT) [rev/day³]. */
  meanMotionDdotRevPerDay3: number;
  /** B* drag term [1/Earth radii]. */
  bstar: number;
  inclinationDeg: number;
  raanDeg: number;
  eccentricity: number;
  argPerigeeDeg: number;
  meanAnomalyDeg: number;
  ephemerisType: number;
  elementSetNo: number;
  revAtEpoch: number;
  /** 1-based line where the record starts in its input. */
  sourceLine: number;
  /** 1-based line holding the catalog number, when not the record's first (an OMM's NORAD_CAT_ID line). */
  catalogNumberLine?: number;
  /** TLE lines (for OMM, written by `writeTle` so SGP4 can run on them). */
  line1: string;
  line2: string;
};

export type ParseResult = {
  format: ElementSetFormat;
  records: ElementSet[];
  errors: ParseError[];
};

export type ParseOptions = {
  /** Skip content detection. */
  format?: Exclude<ElementSetFormat, 'unknown'>;
  /** Reject TLE lines whose modulo-10 checksum is wrong (default true). */
  verifyChecksum?: boolean;
  /** Keep at most this many errors, then one summary error (default 1000). */
  maxErrors?: number;
};

export type SolarActivity = 'low' | 'mean' | 'high';

export type DensityModel = 'cira72-exponential' | 'harris-priester-min' | 'harris-priester-max';

/** The craft as the drag and lifetime models need it. */
export type Craft = {
  massKg: number;
  dragAreaM2: number;
  dragCoefficient: number;
};

/** A sail craft: reflectivity is the specularly reflected fraction (1 = ideal reflector, 0 = absorber). */
export type SailCraft = Craft & {
  sailAreaM2: number;
  reflectivity: number;
};

export type SailMode = 'raising' | 'edge-on' | 'tumbling' | 'unknown';

export type SailingPeriod = { startMs: number; endMs: number; mode: SailMode };
