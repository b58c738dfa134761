/** Hourly values: aggregation from readings, stored-row form, and derivation to the limit's basis. */
export * from './series';
export * from './aggregate';
export * from './derive';
