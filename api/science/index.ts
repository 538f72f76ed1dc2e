/**
 * Eyrie's selectivity engine: pure functions, SI units inside (J/mol, J/(mol·K), K).
 * Sign convention: ΔΔX‡ = X‡(TS→B) − X‡(TS→A), positive favours A, r = [A]/[B].
 */
export * from './constants';
export * from './errors';
export * from './units';
export * from './selectivity';
export * from './activation';
export * from './forecast';
export * from './regression';
export * from './eyring-fit';
export * from './segmented';
export * from './distribution';
export * from './rate';
export * from './erosion';
export * from './screen-model';
export * from './plan-predictive';
export * from './rate-fit';
export * from './plan';
export * from './plan-design';
export * from './comparison';
