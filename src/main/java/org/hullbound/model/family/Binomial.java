package org.hullbound.model.family;

import java.util.List;
import org.apache.commons.math3.special.Beta;
import org.apache.commons.math3.special.Gamma;

/**
 * The binomial family {@code (trials, p)} and {@code (trials, logit_p)}, and the Bernoulli family
 * {@code (p)} and {@code (logit_p)} as binomials of one trial.
 *
 * <p>Log mass {@code log C(trials, x) + x log p + (trials - x) log(1 - p)}, in the saddle-point
 * form of Loader (2000) ({@link SaddlePoint}), whose differences in p stay precise at 1e15 trials
 * where the three terms cancel from 1e15 each; {@code P(X <= n) = I_{1-p}(trials - n, n + 1)} (Abramowitz and Stegun 1964, 26.5.24).
 * On the logit scale {@code log p} and {@code log(1 - p)} come from {@link LogSpace#logInvLogit},
 * so {@code |logit_p|} up to 1e3 and beyond neither overflows nor loses the small probability.
 */
final class Binomial {
  private Binomial() {}

  /**
   * Trials up to which rows of one linear predictor are summed as a group: beyond, {@code log
   * C(trials, y)} and {@code y log p} cancel from hundreds, and each row keeps Loader's form.
   */
  static final double GROUPED_TRIALS = 100;

  static Family binomial() {
    return SimpleFamily.of("binomial", f -> List.of(
        new ByProbability(f, true), new ByLogit(f, true)));
  }

  static Family bernoulli() {
    return SimpleFamily.of("bernoulli", f -> List.of(
        new ByProbability(f, false), new ByLogit(f, false)));
  }

  /** Shared by the four: the trials (1 for bernoulli), log p and log(1 - p). */
  private abstract static class BinomialForm extends DiscreteParametrisation {
    private final boolean withTrials;

    BinomialForm(Family family, boolean withTrials, String name, ArgumentDomain domain) {
      super(family, withTrials ? SupportKind.COUNT_UP_TO_FIRST_ARGUMENT : SupportKind.BINARY,
          withTrials ? new Object[] {"trials", ArgumentDomain.WHOLE, name, domain} : new Object[] {name, domain});
      this.withTrials = withTrials;
    }

    final double trials(double[] args) {
      return withTrials ? args[0] : 1.0;
    }

    final boolean withTrials() {
      return withTrials;
    }

    /** Index of the probability argument. */
    final int probabilityIndex() {
      return withTrials ? 1 : 0;
    }

    abstract double probability(double[] args);

    abstract double complement(double[] args);

    abstract double logProbability(double[] args);

    abstract double logComplement(double[] args);

    /** d(log mass)/d(probability argument). */
    abstract double slope(double x, double trials, double[] args);

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double trials = trials(args);
      if (gradient != null) {
        gradient[0] = 0.0;
        if (withTrials) {
          gradient[1] = 0.0;
        }
        gradient[1 + probabilityIndex()] = slope(x, trials, args);
      }
      return logMass(x, trials, args);
    }

    /**
     * {@code log C(trials, x) + x log p + (trials - x) log(1 - p)}: in Loader's saddle-point form
     * ({@link SaddlePoint#binomial}) where it applies, which keeps its differences in p precise at
     * 1e15 trials; at the ends of the support and where {@code trials p} or {@code trials (1 - p)}
     * underflows, by the terms themselves, which then do not cancel.
     */
    final double logMass(double x, double trials, double[] args) {
      if (x == 0) {
        // + 0.0: a certain outcome has log mass 0.0, not the -0.0 of log1p(-0.0)
        return trials == 0 ? 0.0 : trials * logComplement(args) + 0.0;
      }
      if (x == trials) {
        return trials * logProbability(args);
      }
      double p = probability(args);
      double q = complement(args);
      if (SaddlePoint.applies(trials, p, q)) {
        return SaddlePoint.binomial(x, trials, p, q, Math.fma(-trials, p, x));
      }
      double logChoose = -LogSpace.log1p(trials) - Beta.logBeta(x + 1.0, trials - x + 1.0);
      return logChoose + x * logProbability(args) + (trials - x) * logComplement(args);
    }

    @Override
    final double logLowerTail(double n, double[] args) {
      double trials = trials(args);
      return IncompleteBeta.logRegularized(complement(args), probability(args),
          logComplement(args), logProbability(args), trials - n, n + 1.0);
    }

    @Override
    final double logUpperTail(double n, double[] args) {
      double trials = trials(args);
      return IncompleteBeta.logRegularized(probability(args), complement(args),
          logProbability(args), logComplement(args), n + 1.0, trials - n);
    }

    /** d p / d (probability argument). */
    abstract double probabilitySlope(double[] args);

    @Override
    final double cdfDerivative(int k, double n, double[] args, double logScale) {
      if (k != probabilityIndex()) {
        return Double.NaN;
      }
      // d/dp P(X <= n; trials, p) = -trials pmf(n; trials - 1, p) (differentiating the incomplete
      // beta I_{1-p}(trials - n, n + 1) in its argument, A&S 26.5.24 and 6.6.1).
      double trials = trials(args);
      return -trials * Math.exp(logMass(n, trials - 1.0, args) - logScale) * probabilitySlope(args);
    }

    // log C(n, x) + x logit(p): differences log((n - x)/(x + 1)) + logit(p) fall in x.
    @Override
    public final Curvature curvatureInWholeValue(double[] knownArgs) {
      return Curvature.concave(family().name() + " log mass has differences log((trials - x)/(x"
          + " + 1)) + logit(p), falling in x");
    }

    // log C(n, x) + n log(1 - p) in n: differences log((n + 1)/(n + 1 - x)) + log(1 - p) fall.
    @Override
    public final Curvature curvatureInWholeArgument(int k, double[] knownArgs) {
      if (withTrials && k == 0) {
        return Curvature.concave("binomial log mass in trials n has differences log((n + 1)/(n"
            + " + 1 - x)) + log(1 - p), falling in n");
      }
      return super.curvatureInWholeArgument(k, knownArgs);
    }

    final Curvature trialsFact() {
      return Curvature.notEstablished("binomial trials is a whole number: concavity in a continuous argument does not apply");
    }
  }

  private static final class ByProbability extends BinomialForm {
    ByProbability(Family family, boolean withTrials) {
      super(family, withTrials, "p", ArgumentDomain.PROBABILITY);
    }

    @Override
    double probability(double[] args) {
      return args[probabilityIndex()];
    }

    @Override
    double complement(double[] args) {
      return 1.0 - args[probabilityIndex()];
    }

    @Override
    double logProbability(double[] args) {
      return Math.log(args[probabilityIndex()]);
    }

    @Override
    double logComplement(double[] args) {
      return LogSpace.log1p(-args[probabilityIndex()]);
    }

    @Override
    double probabilitySlope(double[] args) {
      return 1.0;
    }

    @Override
    double slope(double x, double trials, double[] args) {
      double p = args[probabilityIndex()];
      if (p > 0 && p < 1) {
        // x/p - (trials - x)/(1 - p) over one denominator: the two terms near 1e15 at 1e15 trials
        // cancel, their difference (x - trials p) is one fused rounding
        return Math.fma(-trials, p, x) / (p * (1.0 - p));
      }
      return (x == 0 ? 0.0 : x / p) - (x == trials ? 0.0 : (trials - x) / (1.0 - p));
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k != probabilityIndex()) {
        return trialsFact();
      }
      String name = family().name();
      return switch (scale) {
        // x log p + (n - x) log(1 - p): d2 = -x/p^2 - (n - x)/(1 - p)^2.
        case NATURAL -> Curvature.concave(name
            + " log mass is concave in p: x log p + (trials - x) log(1 - p), second derivative -x/p^2 - (trials - x)/(1 - p)^2 <= 0");
        // p = e^u: x u + (n - x) log(1 - e^u), d2 = -(n - x) e^u/(1 - e^u)^2.
        case LOG -> Curvature.concave(name
            + " log mass is concave in u = log(p): x u + (trials - x) log(1 - exp(u)), second derivative -(trials - x) p/(1 - p)^2 <= 0");
        // p = expit(u): x u - n log(1 + e^u), d2 = -n p (1 - p).
        case LOGIT -> Curvature.concave(name
            + " log mass is concave in u = logit(p): x u - trials log(1 + exp(u)), second derivative -trials p(1 - p) < 0");
      };
    }
  }

  private static final class ByLogit extends BinomialForm {
    ByLogit(Family family, boolean withTrials) {
      super(family, withTrials, "logit_p", ArgumentDomain.REAL);
    }

    @Override
    double probability(double[] args) {
      return LogSpace.invLogit(args[probabilityIndex()]);
    }

    @Override
    double complement(double[] args) {
      return LogSpace.invLogit(-args[probabilityIndex()]);
    }

    @Override
    double logProbability(double[] args) {
      return LogSpace.logInvLogit(args[probabilityIndex()]);
    }

    @Override
    double logComplement(double[] args) {
      return LogSpace.logInvLogit(-args[probabilityIndex()]);
    }

    @Override
    double probabilitySlope(double[] args) {
      return probability(args) * complement(args);
    }

    @Override
    double slope(double x, double trials, double[] args) {
      return Math.fma(-trials, probability(args), x);
    }

    @Override
    public AffineRows affineRows(int k) {
      return k == probabilityIndex() ? rows : null;
    }

    private final AffineRows rows = new LogitRows();

    /**
     * The rows' sums, each as {@link #evaluate} after the support test of {@code logDensity}:
     * the ends of the support from one {@code exp(-|eta|)}; a count inside it (binomial) also,
     * with its Stirling errors and {@code log(x (n - x)/n)} kept per row ({@link
     * SaddlePoint#binomial(double, double, double, double, double, double, double)}); anything
     * else by the general path.
     */
    private final class LogitRows implements AffineRows {
      @Override
      public int keptPerRow() {
        return withTrials() ? 2 : 0;
      }

      @Override
      public void keep(double[][] intercepts, int[] interceptStrides, int from, int count,
          double[] kept, int keptFirst) {
        if (!withTrials()) {
          return;
        }
        double[] ys = intercepts[0];
        double[] trialColumn = intercepts[1];
        int ys0 = interceptStrides[0];
        int trials0 = interceptStrides[1];
        for (int j = 0, r = from, q = keptFirst; j < count; j++, r++, q += 2) {
          double y = ys[r * ys0];
          double trials = trialColumn[r * trials0];
          boolean inside = y > 0 && y < trials;
          kept[q] = inside ? SaddlePoint.binomialStirling(y, trials) : Double.NaN;
          kept[q + 1] = inside ? SaddlePoint.binomialSpread(y, trials) : Double.NaN;
        }
      }

      @Override
      public void accumulate(double x, double[][] intercepts, int[] interceptStrides,
          double[][] slopes, int[] slopeStrides, int from, int count, double[] kept,
          int keptFirst, double[] sums, double[] args, double[] gradient) {
        boolean withTrials = withTrials();
        int moving = 1 + probabilityIndex();
        double[] ys = intercepts[0];
        int ys0 = interceptStrides[0];
        double[] trialColumn = withTrials ? intercepts[1] : null;
        int trials0 = withTrials ? interceptStrides[1] : 0;
        double[] as = intercepts[moving];
        int as0 = interceptStrides[moving];
        double[] bs = slopes[moving];
        int bs0 = slopeStrides[moving];
        double total = sums[0];
        double dx = sums[1];
        for (int j = 0, r = from, q = keptFirst; j < count; j++, r++, q += 2) {
          double y = ys[r * ys0];
          double trials = withTrials ? trialColumn[r * trials0] : 1.0;
          double b = bs[r * bs0];
          double eta = b == 0 ? as[r * as0] : as[r * as0] + b * x;
          double value = Double.NaN;
          double g = Double.NaN;
          if ((y == 0 || y == trials) && (!withTrials || ArgumentDomain.WHOLE.accepts(trials))) {
            double e = Math.exp(-Math.abs(eta));
            g = Math.fma(-trials, LogSpace.invLogit(eta, e), y);
            value = y == 0
                ? (trials == 0 ? 0.0 : trials * -LogSpace.log1pExp(eta, e) + 0.0)
                : trials * -LogSpace.log1pExp(-eta, e);
          } else if (withTrials && y > 0 && y < trials && ArgumentDomain.WHOLE.accepts(y)) {
            double e = Math.exp(-Math.abs(eta));
            double probability = LogSpace.invLogit(eta, e);
            double complement = LogSpace.invLogit(-eta, e);
            if (SaddlePoint.applies(trials, probability, complement)) {
              g = Math.fma(-trials, probability, y);
              value = SaddlePoint.binomial(y, trials, probability, complement, g, kept[q],
                  kept[q + 1]);
            }
          }
          if (Double.isNaN(g)) {
            if (withTrials) {
              args[0] = trials;
            }
            args[moving - 1] = eta;
            value = logDensity(y, args, gradient);
            g = gradient[moving];
          }
          total += value;
          dx += 0.0 + g * b;
        }
        sums[0] = total;
        sums[1] = dx;
      }

      /** Sum of the responses, sum of the trials, sum of {@code log C(trials, y)}. */
      @Override
      public int statisticsPerGroup() {
        return 3;
      }

      @Override
      public boolean groupable(double[][] intercepts, int[] interceptStrides, int row) {
        double y = intercepts[0][row * interceptStrides[0]];
        double trials = withTrials() ? intercepts[1][row * interceptStrides[1]] : 1.0;
        return ArgumentDomain.WHOLE.accepts(y) && ArgumentDomain.WHOLE.accepts(trials)
            && y >= 0 && y <= trials && trials <= GROUPED_TRIALS;
      }

      @Override
      public void addToGroup(double[][] intercepts, int[] interceptStrides, int row,
          double[] statistics, int at) {
        double y = intercepts[0][row * interceptStrides[0]];
        double trials = withTrials() ? intercepts[1][row * interceptStrides[1]] : 1.0;
        statistics[at] += y;
        statistics[at + 1] += trials;
        if (y > 0 && y < trials) {
          statistics[at + 2] += Gamma.logGamma(trials + 1) - Gamma.logGamma(y + 1)
              - Gamma.logGamma(trials - y + 1);
        }
      }

      /**
       * A group's log mass {@code sum(y) log expit(eta) + sum(trials - y) log expit(-eta) + sum
       * log C(trials, y)}, linear in the sufficient statistics {@code sum(y)}, {@code
       * sum(trials)} given {@code eta} (common practice: the binomial is an exponential family in
       * {@code eta}); both logs from one {@code e = exp(-|eta|)}, finite at any finite {@code eta}
       * (log space, no overflow at 1e4); slope {@code sum(y) - sum(trials) expit(eta)}.
       *
       * <p>Both logs are {@code max(-+eta, 0) + log(1 + e)}, with {@code log(1 + e)} taken by
       * {@code Math.log} (an intrinsic) rather than {@link LogSpace#log1p}, and with no branch on
       * the data: on grown {@code clinics} (74,000 groups of one to four rows) the loop's branches
       * on the sign of {@code eta} and on empty counts were mispredicted about half the time, and
       * {@code log1p}'s two divisions sat on the critical path. The price is absolute accuracy
       * where relative was had: {@code 1 + e} lies in [1, 2], so its rounding moves its log by at
       * most 2^-53, and {@code Math.log} adds at most one ulp of a result below {@code log 2},
       * 2^-53: each {@code log(1 + e)} is off by at most 2^-52 (2.2e-16) in absolute terms, which
       * loses relative accuracy only where {@code log1p(e)} itself is that small ({@code |eta| >
       * 36}). Where {@code e} is a product of factors ({@link #accumulateFactoredGroups}: {@code
       * Math.exp} within 1 ulp, a reciprocal and the product within half an ulp each, so {@code
       * e} within 3.5 ulps, 7.8e-16 relative) its error moves {@code log(1 + e)} by at most
       * {@code 7.8e-16 e / (1 + e)}, 3.9e-16 more: at most 2^-50 (8.9e-16) in all. A group is
       * then off by at most {@code sum(trials) 2^-50} more than before (its term {@code sum(y)
       * |eta|} alone already carries a rounding of {@code sum(y) |eta| 2^-53}), a conditional
       * over N trials by at most {@code N 2^-50} (120,000 trials: 1.1e-10) at every point, so
       * that the density drawn from is off by a factor within {@code exp(+-1.1e-10)}: no test of
       * any size could see it, and it is below the rounding of the sum of 74,000 terms itself.
       * {@code expit} comes from the same {@code 1 / (1 + e)}.
       */
      @Override
      public void accumulateGroups(double x, double[][] intercepts, int[] interceptStrides,
          double[][] slopes, int[] slopeStrides, int[] rows, int count, double[] statistics,
          double[] sums) {
        sumGroups(x, intercepts, interceptStrides, slopes, slopeStrides, rows, count, statistics,
            null, null, null, sums);
      }

      /** Only {@code exp(-|eta|)} is needed: the logs and {@code expit} follow from it. */
      @Override
      public boolean factorsGroups() {
        return true;
      }

      @Override
      public void accumulateFactoredGroups(double x, double[][] intercepts,
          int[] interceptStrides, double[][] slopes, int[] slopeStrides, int[] rows, int count,
          double[] statistics, double[] groupExponentials, int[] classOf,
          double[] classExponentials, double[] sums) {
        sumGroups(x, intercepts, interceptStrides, slopes, slopeStrides, rows, count, statistics,
            groupExponentials, classOf, classExponentials, sums);
      }

      /**
       * The groups' loop; {@code exp(-|eta|)} from its factors where {@code groupExponentials}
       * is given ({@link AffineRows#accumulateFactoredGroups}: a few ulps, within the error
       * bound above), else by {@code Math.exp}.
       */
      private void sumGroups(double x, double[][] intercepts, int[] interceptStrides,
          double[][] slopes, int[] slopeStrides, int[] rows, int count, double[] statistics,
          double[] groupExponentials, int[] classOf, double[] classExponentials, double[] sums) {
        int moving = 1 + probabilityIndex();
        double[] as = intercepts[moving];
        int as0 = interceptStrides[moving];
        double[] bs = slopes[moving];
        int bs0 = slopeStrides[moving];
        double total = sums[0];
        double dx = sums[1];
        for (int g = 0, q = 0; g < count; g++, q += 3) {
          int r = rows[g];
          double a = as[r * as0];
          double b;
          double eta;
          double e;
          if (groupExponentials == null) {
            b = bs[r * bs0];
            eta = b == 0 ? a : a + b * x;
            e = Math.exp(-Math.abs(eta));
          } else {
            int k = 3 * classOf[g];
            b = classExponentials[k + 2];
            eta = b == 0 ? a : a + b * x;
            e = eta > 0 ? groupExponentials[2 * g + 1] * classExponentials[k + 1]
                : groupExponentials[2 * g] * classExponentials[k];
          }
          double sumY = statistics[q];
          double sumTrials = statistics[q + 1];
          double failures = sumTrials - sumY;
          double onePlus = 1.0 + e;
          double shared = Math.log(onePlus);
          double value = -(sumY * (Math.max(-eta, 0.0) + shared)
              + failures * (Math.max(eta, 0.0) + shared)) + statistics[q + 2];
          if (Double.isNaN(value)) {
            // eta infinite with an empty count: 0 inf; the empty count adds nothing
            value = (sumY == 0 ? 0.0 : sumY * -(eta < 0 ? -eta + shared : shared))
                + (failures == 0 ? 0.0 : failures * -(eta > 0 ? eta + shared : shared))
                + statistics[q + 2];
          }
          double upper = 1.0 / onePlus; // expit(|eta|)
          double slope = Math.fma(-sumTrials, eta >= 0 ? upper : e * upper, sumY);
          total += value;
          dx += 0.0 + slope * b;
        }
        sums[0] = total;
        sums[1] = dx;
      }
    }

    /**
     * At the ends of the support (every Bernoulli term) the log mass is {@code trials log expit(+-
     * eta)} and the slope {@code x - trials expit(eta)}: both from one {@code exp(-|eta|)}, bit for
     * bit what the general path gives with two.
     */
    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      double trials = trials(args);
      if (x != 0 && x != trials) {
        return super.evaluate(x, args, gradient);
      }
      double eta = args[probabilityIndex()];
      double e = Math.exp(-Math.abs(eta));
      if (gradient != null) {
        gradient[0] = 0.0;
        if (probabilityIndex() == 1) {
          gradient[1] = 0.0;
        }
        gradient[1 + probabilityIndex()] = Math.fma(-trials, LogSpace.invLogit(eta, e), x);
      }
      if (x == 0) {
        // + 0.0: a certain outcome has log mass 0.0, not -0.0 (as logMass)
        return trials == 0 ? 0.0 : trials * -LogSpace.log1pExp(eta, e) + 0.0;
      }
      return trials * -LogSpace.log1pExp(-eta, e);
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k != probabilityIndex()) {
        return trialsFact();
      }
      return switch (scale) {
        // x eta - n log(1 + e^eta): d2 = -n p (1 - p).
        case NATURAL -> Curvature.concave(family().name()
            + " log mass is concave in logit_p: x logit_p - trials log(1 + exp(logit_p)), second derivative -trials p(1 - p) < 0");
        default -> Reasons.notAnalysed(this, "logit_p", scale);
      };
    }
  }
}
