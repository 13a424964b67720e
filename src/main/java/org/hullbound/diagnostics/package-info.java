/**
 * Convergence diagnostics and posterior summaries for draws held as chain x iteration arrays.
 *
 * <p>Rank-normalised split R-hat, bulk and tail effective sample size and Monte Carlo standard
 * errors follow Vehtari, Gelman, Simpson, Carpenter and Buerkner (2021), "Rank-normalization,
 * folding, and localization: An improved R-hat for assessing convergence of MCMC", Bayesian
 * Analysis 16(2); the autocorrelation sum is truncated by Geyer's (1992) initial monotone sequence
 * (Statistical Science 7(4)). The package uses nothing else of the project, so a researcher can use
 * it alone. Entry point: {@link org.hullbound.diagnostics.PosteriorSummary#of(String, double[][])}.
 */
package org.hullbound.diagnostics;
