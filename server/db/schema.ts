// Every module's tables, for drizzle-kit and for the typed query builder.
export * from '../modules/accounts/accounts.tables';
export * from '../modules/auth/auth.tables';
export * from '../modules/audit/audit.tables';
export * from '../modules/orbit/orbit.tables';
export * from '../modules/campaigns/campaigns.tables';
export * from '../modules/pledges/pledges.tables';
export * from '../modules/ledger/ledger.tables';
export * from '../modules/payments/payments.tables';
export * from '../modules/dispatches/dispatches.tables';
export * from '../modules/books/books.tables';
export * from '../modules/mail/mail.tables';
export * from '../modules/places/places.tables';
