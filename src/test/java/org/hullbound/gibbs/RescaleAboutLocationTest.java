package org.hullbound.gibbs;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.function.DoubleUnaryOperator;
import java.util.stream.IntStream;
import org.apache.commons.math3.stat.inference.KolmogorovSmirnovTest;
import org.hullbound.diagnostics.PosteriorSummary;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.Update;
import org.junit.jupiter.api.Test;

/**
 * The rescale move about a location unknown ({@code (tau, theta) -> (c tau, mu + c (theta -
 * mu))}, {@code mu} held, drawn from {@code c^K p(g_c x)}) leaves the eight schools posterior
 * invariant. The model is {@link GroupMoveFitTest}'s written centred, {@code y[j] ~
 * normal(theta[j], sigma[j])}, {@code theta[j] ~ normal(mu, tau)}, which has the same posterior
 * of mu and tau (theta = mu + effect), so the reference is the same (Gelman et al., Bayesian Data
 * Analysis, 3rd ed., section 5.4, eqs. 5.20-5.21; commons-math3's multivariate normal as
 * reference library): mean and sd of mu and tau by Simpson's rule, tau's distribution function by
 * the cumulative trapezoid rule. This move is the only one the model has; the sweep is the
 * one-at-a-time updates (tau's own draw after the effects', interwoven) and the move.
 *
 * <p>Checks: mean and sd of mu and tau within 4 MCSE (four checks at about 6e-5 each) and a KS
 * test of every fifth kept draw of tau at level 1e-5 after checking that the thinned draws are
 * nearly independent (bulk-ESS at least 0.8 of their number): 2.5e-4 together. Power: 3200
 * thinned draws give a critical distance of about 0.044 at 1e-5. Broken on purpose (December
 * 2026) with one power of c too many ({@code c^(K + 1) p(g_c x)}: one prior's {@code -log c}
 * cancelled without its power of the Jacobian), the mean of mu came out at 4.27 against 4.44
 * (6.4 MCSE) and the test failed.
 */
class RescaleAboutLocationTest {
  private static final RunSettings SETTINGS = new RunSettings(4, 500, 4000, 1, 13L, 2);

  static String centredModel() {
    return GroupMoveFitTest.model()
        .replace("normal(mean = mu + effect[school], sd = sigma[school])",
            "normal(mean = theta[school], sd = sigma[school])")
        .replace("param effect[school] ~ normal(mean = 0, sd = tau)",
            "param theta[school] ~ normal(mean = mu, sd = tau)");
  }

  /** tau's distribution function by the cumulative trapezoid rule, linear between steps. */
  private static DoubleUnaryOperator tauDistribution() {
    int steps = 16000;
    double top = 80;
    double[] cdf = new double[steps + 1];
    double previous = GroupMoveFitTest.tauDensity(0);
    for (int k = 1; k <= steps; k++) {
      double next = GroupMoveFitTest.tauDensity(top * k / steps);
      cdf[k] = cdf[k - 1] + 0.5 * (previous + next);
      previous = next;
    }
    double total = cdf[steps];
    return x -> {
      if (x <= 0 || x >= top) {
        return x <= 0 ? 0 : 1;
      }
      double at = x / top * steps;
      int k = (int) at;
      return (cdf[k] + (at - k) * (cdf[k + 1] - cdf[k])) / total;
    };
  }

  /** The KS p-value of {@code data} against {@code cdf} (commons-math3's exact distribution). */
  private static double ksPValue(double[] data, DoubleUnaryOperator cdf) {
    double[] sorted = data.clone();
    Arrays.sort(sorted);
    double distance = 0;
    for (int i = 0; i < sorted.length; i++) {
      double f = cdf.applyAsDouble(sorted[i]);
      distance = Math.max(distance,
          Math.max((i + 1.0) / sorted.length - f, f - (double) i / sorted.length));
    }
    return 1 - new KolmogorovSmirnovTest().cdf(distance, sorted.length);
  }

  @Test
  void theRescaleAboutTheMeanUnknownKeepsTheEightSchoolsPosterior() {
    BoundModel bound =
        BoundModel.bind(Parser.parse(SourceText.of("schools.hbm", centredModel())), List.of());
    List<Update> moves = bound.moves();
    assertEquals(1, moves.size(), "the centred model's moves: " + moves);
    assertTrue(moves.get(0) instanceof Update.GroupMove g
        && g.kind() == Update.MoveKind.RESCALE && g.logConcave(), moves.get(0).toString());
    int tau = bound.unknown("tau").index();
    assertEquals(List.of(0, 1), List.of(bound.unknown("mu").index(), tau));
    Fits.Fit fit = Fits.run(ModelSampler.of(bound, Map.of()).sampler(), SETTINGS);
    fit.assertMomentsWithinFourMcse(GroupMoveFitTest.reference());
    double[][] thinned = Arrays.stream(fit.store().draws(tau))
        .map(chain -> IntStream.range(0, chain.length / 5).mapToDouble(i -> chain[5 * i])
            .toArray())
        .toArray(double[][]::new);
    double[] pooled = Arrays.stream(thinned).flatMapToDouble(Arrays::stream).toArray();
    double ess = PosteriorSummary.of("thinned tau", thinned).essBulk();
    assertTrue(ess >= 0.8 * pooled.length,
        "thinned draws of tau are not nearly independent: bulk-ESS " + ess + " of "
            + pooled.length);
    double p = ksPValue(pooled, tauDistribution());
    assertTrue(p > 1e-5, "KS p-value of tau: " + p);
    assertTrue(fit.reports().get(tau).method().endsWith("+ rescale move"),
        fit.reports().get(tau).method());
    assertTrue(fit.reports().get(tau).switches().isEmpty(), fit.reports().get(tau).switches()
        .toString());
  }
}
