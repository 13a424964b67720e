package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.apache.commons.math3.distribution.AbstractRealDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.junit.jupiter.api.Test;

/**
 * An unknown sent to adaptive rejection whose conditional turns out not to be log-concave: the
 * hull detects it, the unknown switches to the fallback, the draw is redone and the switch is
 * reported; the draws still follow the target.
 */
class FallbackSwitchTest {

  /** 0.5 N(-2, 1) + 0.5 N(2, 1): bimodal, so not log-concave (log-density rises again past 0). */
  private static final ScalarConditional MIXTURE =
      (u, state, slope) -> {
        double a = -0.5 * (u + 2) * (u + 2);
        double b = -0.5 * (u - 2) * (u - 2);
        double top = Math.max(a, b);
        double value = top + Math.log(Math.exp(a - top) + Math.exp(b - top));
        if (slope != null) {
          double wa = Math.exp(a - value);
          double wb = Math.exp(b - value);
          slope[0] = -wa * (u + 2) - wb * (u - 2);
        }
        return value;
      };

  private static final class Mixture extends AbstractRealDistribution {
    private final NormalDistribution left = new NormalDistribution(null, -2, 1);
    private final NormalDistribution right = new NormalDistribution(null, 2, 1);

    Mixture() {
      super(null);
    }

    @Override
    public double density(double x) {
      return 0.5 * left.density(x) + 0.5 * right.density(x);
    }

    @Override
    public double cumulativeProbability(double x) {
      return 0.5 * left.cumulativeProbability(x) + 0.5 * right.cumulativeProbability(x);
    }

    @Override
    public double getNumericalMean() {
      return 0;
    }

    @Override
    public double getNumericalVariance() {
      return 5;
    }

    @Override
    public double getSupportLowerBound() {
      return Double.NEGATIVE_INFINITY;
    }

    @Override
    public double getSupportUpperBound() {
      return Double.POSITIVE_INFINITY;
    }

    @Override
    @SuppressWarnings("deprecation") public boolean isSupportLowerBoundInclusive() {
      return false;
    }

    @Override
    @SuppressWarnings("deprecation") public boolean isSupportUpperBoundInclusive() {
      return false;
    }

    @Override
    public boolean isSupportConnected() {
      return true;
    }
  }

  /**
   * One chain, 3200 draws thinned by 10 (seed 5); KS at level 1e-5 (critical distance 2.47 /
   * sqrt(3200), that of 2000 draws at 0.001) against the mixture's exact
   * CDF. Thinning keeps the autocorrelation of the fallback chain small enough for KS (checked:
   * the test also asserts a bulk ESS above 1000 of the 3200 kept draws).
   */
  @Test
  void aViolationFoundAtRunTimeSwitchesToTheFallbackAndIsReported() {
    GibbsSampler sampler =
        GibbsSampler.of(
            1,
            List.of(new UpdateRule.AdaptiveRejection(0, MIXTURE, "claimed log-concave in this test")),
            (state, rng) -> state[0] = rng.nextDouble(-2, 2));
    Fits.Fit fit = Fits.run(sampler, new RunSettings(1, 100, 3200, 10, 5L, 1));
    UpdateReport report = fit.reports().get(0);
    assertEquals(1, report.switches().size(), report.switches().toString());
    assertTrue(report.switches().get(0).startsWith("chain 1 switched to"), report.switches().get(0));
    assertTrue(report.method().startsWith("adaptive rejection, then "), report.method());
    assertTrue(fit.summary(0).essBulk() > 1000, "ess " + fit.summary(0).essBulk());
    double p = new KolmogorovSmirnovTest().kolmogorovSmirnovTest(new Mixture(), fit.store().draws(0)[0]);
    assertTrue(p > 1e-5, "KS p = " + p);
  }

  /**
   * A normal conditional carrying a constant of 1e12, whose values the hull cannot check to its
   * tolerance (2 ulp(1e12) = 2.4e-4 against 1e-8): the refusal ({@code ImpreciseDensityException})
   * switches it to the fallback as a violation does, and the draws follow N(0, 1) (commons-math3);
   * same settings and level as above.
   */
  @Test
  void valuesTooCoarseForTheHullSwitchToTheFallbackAndIsReported() {
    ScalarConditional swamped =
        (u, state, slope) -> {
          if (slope != null) {
            slope[0] = -u;
          }
          return -0.5 * u * u + 1e12;
        };
    GibbsSampler sampler =
        GibbsSampler.of(
            1,
            List.of(new UpdateRule.AdaptiveRejection(0, swamped, "claimed log-concave in this test")),
            (state, rng) -> state[0] = rng.nextDouble(-2, 2));
    Fits.Fit fit = Fits.run(sampler, new RunSettings(1, 100, 3200, 10, 5L, 1));
    UpdateReport report = fit.reports().get(0);
    assertEquals(1, report.switches().size(), report.switches().toString());
    assertTrue(report.switches().get(0).contains("swamps"), report.switches().get(0));
    double p =
        new KolmogorovSmirnovTest()
            .kolmogorovSmirnovTest(new NormalDistribution(null, 0, 1), fit.store().draws(0)[0]);
    assertTrue(p > 1e-5, "KS p = " + p);
  }
}
