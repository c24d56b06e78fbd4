// What a database failure means for the caller: the service is unavailable for now (503), or the request
// carried a value PostgreSQL refuses (400). Drizzle wraps driver errors (`cause`), so the chain is walked.

/** Seconds a client should wait before retrying while the database is unavailable. */
export const DATABASE_RETRY_AFTER_SECONDS = 5;

type ErrorLike = { code?: unknown; message?: unknown; cause?: unknown };

const NETWORK_CODES = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EHOSTUNREACH',
  'ENETUNREACH',
  'ENOTFOUND',
  'EAI_AGAIN',
  'EPIPE',
]);

// node-postgres raises these without a code when a connection cannot be made or is lost.
const NETWORK_MESSAGES = [
  /timeout exceeded when trying to connect/i,
  /connection terminated/i,
  /connection timeout/i,
  /not queryable/i,
  /cannot use a pool after calling end/i,
];

function isSqlState(code: unknown): code is string {
  return typeof code === 'string' && /^[0-9A-Z]{5}$/.test(code);
}

function unavailableSqlState(code: string) {
  return (
    code.startsWith('08') || // connection exception
    code.startsWith('57P') || // admin/crash shutdown, cannot connect now, database dropped, idle session timeout
    code === '57014' || // query_canceled: statement_timeout, e.g. a table locked by a long transaction
    code === '55P03' || // lock_not_available (lock_timeout)
    code === '53300' || // too_many_connections
    code === '53000' // insufficient_resources
  );
}

export function classifyDatabaseError(err: unknown): 'unavailable' | 'bad_value' | null {
  let e: unknown = err;
  for (let depth = 0; e && typeof e === 'object' && depth < 5; depth++) {
    const { code, message, cause } = e as ErrorLike;
    if (isSqlState(code)) {
      if (unavailableSqlState(code)) return 'unavailable';
      if (code.startsWith('22')) return 'bad_value';
    }
    if (typeof code === 'string' && NETWORK_CODES.has(code)) return 'unavailable';
    if (typeof message === 'string' && NETWORK_MESSAGES.some((m) => m.test(message))) return 'unavailable';
    // AggregateError (a host with several addresses, all refusing).
    const errors = (e as { errors?: unknown }).errors;
    if (Array.isArray(errors) && errors.some((x) => classifyDatabaseError(x) === 'unavailable')) return 'unavailable';
    e = cause;
  }
  return null;
}
