/**
 * Conventions of analyseDataset, in words: rendered on /docs/api and kept here, beside the
 * code they describe, so the documentation cannot drift from the engine.
 */
export const ANALYSIS_CONVENTIONS: readonly string[] = [
  'Units: T in K; k in the canonical unit of the order (s⁻¹; cm³ molecule⁻¹ s⁻¹; cm⁶ molecule⁻² s⁻¹); Ea and ΔH‡ in J mol⁻¹; ΔS‡ in J mol⁻¹ K⁻¹; "lnk" is the natural logarithm of k in canonical units. Constants are CODATA 2018 (constants.ts).',
  "Fits are weighted linear least squares of ln k by Householder QR on centred, scaled columns: Arrhenius ln k = ln A − Ea/(RT); modified Arrhenius ln k = ln A + n ln(T/T0) − Ea/(RT) (T0 = 298.15 K unless given); Eyring ln(k_c·h/(k_B·T)) = ΔS‡/R − ΔH‡/(RT).",
  "Weights are 1/sigmaLnK² when every point has sigmaLnK; otherwise all fits are unweighted (flag `uncertainties_ignored` when only some points state one).",
  "covariance = s²(XᵀWX)⁻¹ with s² = RSS_w/dof, dof = n − (number of coefficients); parameter order [lnA, Ea] and [lnA, n, Ea]. se = √diag(covariance).",
  "r2 is the weighted R² about the weighted mean of ln k; residualSD = s.",
  "chi2Reduced (weighted fits only) = RSS_w/dof with the stated, absolute σ.",
  "aicc = −2 ln L + 2k + 2k(k+1)/(n − k − 1), k = number of coefficients (σ not counted), ln L the Gaussian log-likelihood at σ̂² = RSS_w/n including ½Σ ln wᵢ.",
  "k298 is the Arrhenius k at 298.15 K with the 95 % confidence interval exp(ln k̂ ± t_{0.975,dof}·se(ln k̂)).",
  "Diagnostics (Arrhenius fit, n ≥ 4) use the whitened residuals eᵢ = √wᵢ·rᵢ: leverage hᵢ (hat matrix diagonal), studentized eᵢ/(s√(1−hᵢ)), externally studentized with s₍ᵢ₎ from the fit without point i, Cook's distance rᵢ²hᵢ/(p(1−hᵢ)). Points with hᵢ = 1 report 0.",
  'Curvature (n ≥ 4 and ≥ 3 distinct temperatures): extra-sum-of-squares F on (1, n − 3) dof, its p-value, deltaAICc = AICc(modified) − AICc(Arrhenius), direction "up" when n > 0 (apparent Ea(T) = Ea + nRT rises with T).',
  "band: the 95 % pointwise confidence band of ln k for the chosen model — modified Arrhenius when the curvature test gives p < 0.05, otherwise Arrhenius — at 50 temperatures from Tmin to Tmax evenly spaced in 1/T.",
  "Eyring: κ = 1; for orders 2 and 3 the standard state is c° = 1 mol dm⁻³ (stated in `eyring.convention`). Null-able for forward compatibility; present for every valid input.",
  "No NaN or ±Infinity anywhere. When dof = 0: se entries, covariance, residualSD, chi2Reduced, the k298 limits and the band limits are null. aicc (and so deltaAICc) is null when n − k − 1 ≤ 0. r2 is null when every ln k is equal. A and k298 values are null only if exp() would overflow a double. modifiedArrhenius is null with fewer than 3 distinct temperatures; diagnostics and curvature are null with fewer than 4 points.",
  "Residuals at rounding level (RSS below Σwᵢ(1e-13·(1+|ln kᵢ|))²) count as an exact fit: no outliers or curvature are reported from noise-free data.",
  "Flags: `points` holds zero-based indices; messages number points from 1. Thresholds: outlier = |externally studentized| > t_{1−0.05/(2n), n−3} (Bonferroni); influential_point = Cook's distance > 4/n; curvature p < 0.05; narrow_range = Tmax/Tmin < 1.05, or se(Ea)/|Ea| > 50 % with se(Ea) > 1 kJ mol⁻¹; excess_scatter = χ² upper-tail p < 0.01 (weighted fits); negative_activation_energy = Ea < −1 J mol⁻¹ (info); reported_fit_disagrees = the reported expression leaves the band (plus 1 % for rounding of published parameters) anywhere on the band grid, or differs by > 1 % when dof = 0.",
];
