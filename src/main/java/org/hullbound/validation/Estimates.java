package org.hullbound.validation;

import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.MonteCarloStandardError;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.diagnostics.VariableSummary;

/**
 * A posterior statistic estimated from chains, with its Monte Carlo standard error.
 *
 * <p>Mean: the diagnostics package's estimate and MCSE ({@code sd / sqrt(ess_mean)}, Vehtari et
 * al. 2021). Standard deviation {@code s = sqrt(v)}: the MCSE of the variance {@code v} is the
 * MCSE of the mean of the squared deviations {@code (x - mean)^2}, and the delta method gives
 * {@code mcse(s) = mcse(v) / (2 s)} (common practice; the same route as the posterior package of
 * Vehtari et al. 2021 takes for the sd).
 *
 * @param value the estimate
 * @param mcse its Monte Carlo standard error, NaN when it cannot be computed
 */
record Estimates(double value, double mcse) {

  static Estimates of(Quantity.Statistic statistic, double[][] chains) {
    VariableSummary summary = PosteriorSummary.of("x", chains);
    if (statistic == Quantity.Statistic.MEAN) {
      return new Estimates(summary.mean(), summary.mcseMean());
    }
    double mean = summary.mean();
    double sd = summary.sd();
    Draws squares = Draws.of(chains).map(x -> (x - mean) * (x - mean));
    double mcseVariance = MonteCarloStandardError.mean(squares);
    return new Estimates(sd, mcseVariance / (2 * sd));
  }
}
