package org.hullbound.diagnostics;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.Comparator;
import java.util.stream.IntStream;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;

/**
 * A second implementation of the convergence diagnostics, written in the tests straight from
 * Vehtari, Gelman, Simpson, Carpenter and Buerkner (2021), "Rank-normalization, folding, and
 * localization: An improved R-hat for assessing convergence of MCMC", Bayesian Analysis 16(2),
 * 667-718, to check {@code org.hullbound.diagnostics} against. It calls none of the production
 * helpers: plain arrays, the autocovariance by its direct sum, ranks by sorting indices, the
 * inverse normal and Beta quantiles from commons-math3 3.6.1 as the reference library. It favours
 * the paper's formulas over speed. Public so that tests of fits in other packages can use it.
 *
 * <p>Chains are {@code double[m][n]}, n even (so that splitting drops nothing).
 */
public final class PaperDiagnostics {

  private static final NormalDistribution STANDARD_NORMAL = new NormalDistribution(null, 0, 1);

  private PaperDiagnostics() {}

  /** Section 4.1: every chain cut into its first and second half. */
  public static double[][] split(double[][] chains) {
    int n = chains[0].length;
    int half = n / 2;
    double[][] halves = new double[2 * chains.length][];
    for (int c = 0; c < chains.length; c++) {
      halves[2 * c] = Arrays.copyOfRange(chains[c], 0, half);
      halves[2 * c + 1] = Arrays.copyOfRange(chains[c], n - half, n);
    }
    return halves;
  }

  private static double mean(double[] x) {
    double sum = 0;
    for (double v : x) {
      sum += v;
    }
    return sum / x.length;
  }

  /** The sample variance with divisor n - 1. */
  private static double variance(double[] x) {
    double m = mean(x);
    double sum = 0;
    for (double v : x) {
      sum += (v - m) * (v - m);
    }
    return sum / (x.length - 1);
  }

  private static double[] pooled(double[][] chains) {
    return Arrays.stream(chains).flatMapToDouble(Arrays::stream).toArray();
  }

  /**
   * Equations 3 and 4: B = N / (M - 1) sum (mean_m - mean)^2, W = mean of the chain variances,
   * var+ = (N - 1) / N W + B / N, R-hat = sqrt(var+ / W).
   */
  public static double rhat(double[][] chains) {
    int m = chains.length;
    int n = chains[0].length;
    double[] means = new double[m];
    double within = 0;
    for (int c = 0; c < m; c++) {
      means[c] = mean(chains[c]);
      within += variance(chains[c]) / m;
    }
    double between = n * variance(means);
    double varPlus = (n - 1.0) / n * within + between / n;
    return Math.sqrt(varPlus / within);
  }

  /**
   * Equation 14: z = Phi^-1((r - 3/8) / (S + 1/4)), r the rank among all S draws of all chains,
   * tied draws given the average of their ranks.
   */
  public static double[][] rankNormalized(double[][] chains) {
    double[] all = pooled(chains);
    int s = all.length;
    Integer[] order = IntStream.range(0, s).boxed().toArray(Integer[]::new);
    Arrays.sort(order, Comparator.comparingDouble(i -> all[i]));
    double[] rank = new double[s];
    int i = 0;
    while (i < s) {
      int j = i;
      while (j + 1 < s && all[order[j + 1]] == all[order[i]]) {
        j++;
      }
      // sorted places i..j (0-based) hold equal draws: ranks i+1 .. j+1, average (i + j) / 2 + 1
      for (int k = i; k <= j; k++) {
        rank[order[k]] = (i + j) / 2.0 + 1;
      }
      i = j + 1;
    }
    double[][] z = new double[chains.length][chains[0].length];
    int at = 0;
    for (int c = 0; c < chains.length; c++) {
      for (int t = 0; t < chains[c].length; t++) {
        z[c][t] = STANDARD_NORMAL.inverseCumulativeProbability((rank[at++] - 0.375) / (s + 0.25));
      }
    }
    return z;
  }

  /** Section 4.2: |x - median| with the median of all draws (middle pair averaged when even). */
  public static double[][] folded(double[][] chains) {
    double[] sorted = pooled(chains);
    Arrays.sort(sorted);
    int s = sorted.length;
    double median = s % 2 == 1 ? sorted[s / 2] : 0.5 * (sorted[s / 2 - 1] + sorted[s / 2]);
    double[][] f = new double[chains.length][];
    for (int c = 0; c < chains.length; c++) {
      f[c] = Arrays.stream(chains[c]).map(x -> Math.abs(x - median)).toArray();
    }
    return f;
  }

  /** Bulk R-hat: split, rank-normalised (section 4.1). */
  public static double rhatBulk(double[][] chains) {
    return rhat(rankNormalized(split(chains)));
  }

  /** Tail R-hat: split, folded, rank-normalised (section 4.2). */
  public static double rhatTail(double[][] chains) {
    return rhat(rankNormalized(folded(split(chains))));
  }

  /**
   * The autocovariance of one chain at lag t by its direct sum, (1 / N) sum_{i < N - t} (x_i -
   * mean)(x_{i+t} - mean) (the biased estimator of the paper's section 3.2).
   */
  private static double autocovariance(double[] x, double mean, int t) {
    double sum = 0;
    for (int i = 0; i + t < x.length; i++) {
      sum += (x[i] - mean) * (x[i + t] - mean);
    }
    return sum / x.length;
  }

  /**
   * Section 3.2, equations 10 and 11: rho_t = 1 - (W - mean_m(s_m^2 rho_t,m)) / var+, rho_t,m the
   * chain's autocorrelation; pair sums P_k = rho_2k + rho_2k+1 up to the last positive one, made
   * non-increasing (Geyer's initial monotone sequence, Geyer 1992); tau = -1 + 2 sum P_k; ESS = S
   * / tau.
   */
  public static double ess(double[][] chains) {
    int m = chains.length;
    int n = chains[0].length;
    double[] means = new double[m];
    double[] gamma0 = new double[m];
    double within = 0;
    for (int c = 0; c < m; c++) {
      means[c] = mean(chains[c]);
      gamma0[c] = autocovariance(chains[c], means[c], 0);
      within += variance(chains[c]) / m;
    }
    double varPlus = (n - 1.0) / n * within + (m > 1 ? variance(means) : 0);
    double sum = 0;
    double previous = Double.POSITIVE_INFINITY;
    for (int k = 0; 2 * k + 1 < n; k++) {
      double pair = rho(chains, means, gamma0, within, varPlus, 2 * k)
          + rho(chains, means, gamma0, within, varPlus, 2 * k + 1);
      if (pair < 0) {
        break;
      }
      pair = Math.min(pair, previous);
      sum += pair;
      previous = pair;
    }
    double tau = -1 + 2 * sum;
    return (double) m * n / tau;
  }

  private static double rho(
      double[][] chains, double[] means, double[] gamma0, double within, double varPlus, int t) {
    double meanScaled = 0;
    for (int c = 0; c < chains.length; c++) {
      // a constant chain (an indicator can be one) has s_m^2 = 0: its term is 0, not 0 / 0
      if (gamma0[c] > 0) {
        double s2 = variance(chains[c]);
        meanScaled += s2 * autocovariance(chains[c], means[c], t) / gamma0[c] / chains.length;
      }
    }
    return 1 - (within - meanScaled) / varPlus;
  }

  /** Bulk ESS: of split, rank-normalised chains (section 4.1). */
  public static double essBulk(double[][] chains) {
    return ess(rankNormalized(split(chains)));
  }

  /**
   * The p-quantile of all draws, definition 7 of Hyndman and Fan (1996): with h = (S - 1) p, x_(floor
   * h) + (h - floor h)(x_(floor h + 1) - x_(floor h)), 0-based.
   */
  public static double quantile(double[][] chains, double p) {
    double[] sorted = pooled(chains);
    Arrays.sort(sorted);
    double h = (sorted.length - 1) * p;
    int below = (int) Math.floor(h);
    if (below + 1 >= sorted.length) {
      return sorted[sorted.length - 1];
    }
    return sorted[below] + (h - below) * (sorted[below + 1] - sorted[below]);
  }

  /** Section 4.3: the ESS of the indicator x &lt;= q_p on split chains. */
  public static double essQuantile(double[][] chains, double p) {
    double[][] split = split(chains);
    double q = quantile(split, p);
    double[][] indicator = new double[split.length][];
    for (int c = 0; c < split.length; c++) {
      indicator[c] = Arrays.stream(split[c]).map(x -> x <= q ? 1 : 0).toArray();
    }
    return ess(indicator);
  }

  /** Section 4.3: tail ESS, the smaller of the quantile ESS at 5% and 95%. */
  public static double essTail(double[][] chains) {
    return Math.min(essQuantile(chains, 0.05), essQuantile(chains, 0.95));
  }

  /** Section 4.3: ESS for the mean, of split chains as they are. */
  public static double essMean(double[][] chains) {
    return ess(split(chains));
  }

  /** MCSE of the mean: sd of all draws over sqrt(ESS for the mean). */
  public static double mcseMean(double[][] chains) {
    return Math.sqrt(variance(pooled(chains))) / Math.sqrt(essMean(chains));
  }

  /**
   * Section 4.3, MCSE of a quantile: a1, a2 the Phi(-1) and Phi(1) quantiles of Beta(ESS p + 1,
   * ESS (1 - p) + 1); the sorted draws at (1-based) ranks max(floor(a1 S), 1) and min(ceil(a2 S),
   * S); half their distance.
   */
  public static double mcseQuantile(double[][] chains, double p) {
    double e = essQuantile(chains, p);
    BetaDistribution beta = new BetaDistribution(null, e * p + 1, e * (1 - p) + 1);
    double a1 = beta.inverseCumulativeProbability(STANDARD_NORMAL.cumulativeProbability(-1));
    double a2 = beta.inverseCumulativeProbability(STANDARD_NORMAL.cumulativeProbability(1));
    double[] sorted = pooled(chains);
    Arrays.sort(sorted);
    int s = sorted.length;
    int lower = (int) Math.max(Math.floor(a1 * s), 1);
    int upper = (int) Math.min(Math.ceil(a2 * s), s);
    return (sorted[upper - 1] - sorted[lower - 1]) / 2;
  }

  /** Relative agreement required of the production diagnostics. */
  public static final double RELATIVE = 1e-10;

  /** Checks every production diagnostic of {@code chains} against this implementation. */
  public static void assertAgreement(double[][] chains, String what) {
    Draws draws = Draws.of(chains);
    RankNormalizedRhat rhat = Rhat.rankNormalized(draws);
    close(rhatBulk(chains), rhat.bulk(), what + ": bulk R-hat");
    close(rhatTail(chains), rhat.tail(), what + ": tail R-hat");
    close(essBulk(chains), EffectiveSampleSize.bulk(draws), what + ": bulk ESS");
    close(essTail(chains), EffectiveSampleSize.tail(draws), what + ": tail ESS");
    close(essMean(chains), EffectiveSampleSize.mean(draws), what + ": mean ESS");
    close(
        mcseMean(chains), MonteCarloStandardError.mean(draws), what + ": MCSE mean");
    for (double p : new double[] {0.05, 0.5, 0.95}) {
      close(
          essQuantile(chains, p),
          EffectiveSampleSize.quantile(draws, p),
          what + ": ESS of the " + p + " quantile");
      close(
          mcseQuantile(chains, p),
          MonteCarloStandardError.quantile(draws, p),
          what + ": MCSE of the " + p + " quantile");
    }
  }

  private static void close(double expected, double actual, String what) {
    assertEquals(expected, actual, RELATIVE * Math.abs(expected), what);
  }
}
