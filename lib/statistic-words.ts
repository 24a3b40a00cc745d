/**
 * Statistics on public pages in plain words first, the technical name second (shown after the
 * plain words, with what it means on hover and in the page's "What these numbers mean" list).
 * Pure: pages and client components share it.
 */
export interface StatisticWords {
  /** What a reader who is no statistician calls it. */
  plain: string;
  /** Its technical name, secondary. */
  term: string;
  /** One sentence: what it is. */
  explain: string;
}

export const STATISTIC_WORDS = {
  refit: {
    plain: "our re-fit",
    term: "re-fit",
    explain:
      "Every dataset is fitted again here the same way (least squares of ln k against 1/T, weighted by the stated uncertainties when there are any); these are not the authors' own values.",
  },
  standardError: {
    plain: "Give or take",
    term: "standard error",
    explain: "How far the fitted value could move if the measurements were repeated: about two thirds of the time within this much.",
  },
  r2: {
    plain: "How closely the line follows the points",
    term: "R²",
    explain: "1 means the fitted line passes through every point; lower values mean more scatter around it.",
  },
  dof: {
    plain: "points beyond the parameters",
    term: "degrees of freedom, dof",
    explain: "The number of points minus the number of fitted parameters: how much the data can say about the scatter.",
  },
  residualSD: {
    plain: "Typical distance of a point from the line",
    term: "SD of ln k residuals",
    explain: "The standard deviation of ln k minus the fitted ln k; 0.1 means points typically sit about 10 % off the line.",
  },
  scatterRatio: {
    plain: "Scatter compared with the stated uncertainties",
    term: "√(χ²/dof)",
    explain: "1 when the points scatter as much as their stated uncertainties say; above 1, more than stated. Dimensionless.",
  },
  sigmaLnK: {
    plain: "Stated uncertainty, as a fraction",
    term: "σ(ln k)",
    explain: "The stated uncertainty of k turned into one of ln k: 0.05 is about ±5 %.",
  },
  residual: {
    plain: "Off the fitted line",
    term: "residual, ln k",
    explain: "The point's ln k minus the fitted line's ln k at its temperature: 0.1 is about 10 % above the line.",
  },
  residualInSigma: {
    plain: "Off the line, in stated uncertainties",
    term: "residual in σ",
    explain: "The distance from the line divided by the point's own stated uncertainty: beyond 2 or 3 is far for the uncertainty stated.",
  },
  band: {
    plain: "Where the true line most likely lies",
    term: "95 % confidence band",
    explain: "The range the fitted line would stay within 95 times out of 100 if the measurements were repeated.",
  },
  consensus: {
    plain: "Combined expression",
    term: "consensus",
    explain:
      "One expression fitted to the counted datasets together, allowing for their disagreement beyond their own uncertainties; retracted and evaluated datasets never count.",
  },
  spread: {
    plain: "How far apart the datasets are",
    term: "spread",
    explain:
      "The highest over the lowest rate constant of the datasets' own preferred fits, at the middle of the temperatures they cover together; retracted datasets never count.",
  },
  uncertaintyFactor: {
    plain: "Within a factor of",
    term: "uncertainty factor f(T)",
    explain: "The combined value divided and multiplied by f covers 95 % of the likely values at that temperature.",
  },
  betweenDatasets: {
    plain: "Disagreement between datasets beyond their own uncertainties",
    term: "between-dataset variance τ², I², Q",
    explain:
      "τ² is the extra variance of ln k between datasets; I² the share of the total disagreement it explains; Q the test statistic it comes from, on dof degrees of freedom.",
  },
} as const satisfies Record<string, StatisticWords>;

export type StatisticId = keyof typeof STATISTIC_WORDS;
