/**
 * The safety cautions every answer that suggests a temperature or a time carries (the web
 * shows its own, shorter SafetyCaution beside such results as well).
 */
export const SELECTIVITY_CAUTION =
  'Forecasts are model estimates: confirm the selectivity with a run at the chosen temperature before relying on it. ' +
  'A colder or warmer process changes more than selectivity: a slow, cold reaction can accumulate dosed reagent and release it suddenly if cooling fails or the batch warms (thermal runaway), ' +
  'so reaction calorimetry and a process-safety review are needed before changing the temperature on scale; cryogenic work adds its own hazards. Follow local codes and licensed practice.';

export const KINETICS_CAUTION =
  'Times and rates here are model estimates from the Eyring–Polanyi equation with constant activation parameters: confirm them by experiment at the chosen temperature before relying on them. ' +
  'A cold, slow reaction can accumulate dosed reagent that a warm-up or cooling failure then releases at once (thermal runaway), so have reaction calorimetry and a process-safety review done before changing temperature on scale. ' +
  'Follow local codes and licensed practice.';
