// Every module's tables, for drizzle-kit and for the typed query builder.
export * from '../modules/accounts/accounts.tables';
export * from '../modules/auth/auth.tables';
export * from '../modules/audit/audit.tables';
export * from '../modules/orbit/orbit.tables';
