/**
 * @flueledger/calc — combustion and emissions calculations. Pure functions: no I/O, no clock,
 * no environment. Every constant and formula names its published source where it is defined.
 */
export * from './errors';

// --- combustion: fuels, stoichiometry, F-factors, conversions, thermochemistry ---
export * from './constants';
export * from './conversions';
export * from './fuels';
export * from './heating-value';
export * from './stoichiometry';
export * from './f-factors';
export * from './emission-rates';
export * from './mass';
export * from './thermo';
export * from './flame';

// --- compliance: readings, hourly values, periods, averaging, limits, evaluation, headroom ---
export * from './readings';
export * from './hourly';
export * from './periods';
export * from './averaging';
export * from './limits';
export * from './limits/describe';
export * from './compliance';
export * from './headroom';
