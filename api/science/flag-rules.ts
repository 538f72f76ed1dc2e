/**
 * When the Eyring fit flags a run, in a module of its own so the web app's residual tables can read
 * the same limits without loading the fit.
 */
export const FLAG_RULES = {
  /** |externally studentized residual| above this → 'outlier' (≈ a 3-sigma event). */
  outlierStudentized: 3,
  /** No run is flagged below this many residual degrees of freedom: too few to tell an odd run from scatter. */
  minimumDof: 3,
  /** With a known assay precision, a residual within this many assay SDs is not called an outlier. */
  assaySigmas: 2,
  /** leverage above 2p/n with p = 2 parameters → 'high-leverage' (Hoaglin & Welsch 1978 rule). */
  leverageFactor: 2,
  /** Cook's distance above 1 → 'influential' (Cook & Weisberg 1982 conventional cut-off). */
  cooksDistance: 1,
} as const;

/** The leverage above which a run of a fit of `n` runs is flagged 'high-leverage': 2p/n with p = 2. */
export const highLeverageLimit = (n: number): number => (FLAG_RULES.leverageFactor * 2) / n;
