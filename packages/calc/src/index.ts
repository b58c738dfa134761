/**
 * @flueledger/calc — combustion and emissions calculations. Pure functions: no I/O, no clock,
 * no environment. Every constant and formula names its published source where it is defined.
 */
export * from './errors';

// --- combustion: fuels, stoichiometry, F-factors, conversions, thermochemistry ---

// --- compliance: readings, hourly values, periods, averaging, limits, evaluation, headroom ---
