// Barrel required by drizzle-kit and the typed client.
export * from './organisations';
export * from './users';
export * from './catalog';
export * from './sites';
export * from './claims';
export * from './payments';
export * from './system';
export * from './catalog-history';
export * from './idempotency';
export * from './approval-limits';
export * from './throttle';
export * from './uploads';
export * from './second-factor';
