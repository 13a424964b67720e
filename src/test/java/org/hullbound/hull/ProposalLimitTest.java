package org.hullbound.hull;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.Duration;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.junit.jupiter.api.Test;

/**
 * {@link HullOptions#maximumProposals()}: a draw whose hull lies far above the density gives up
 * with {@link ProposalLimitException} instead of spinning, and the cap counts the proposals of one
 * draw, so that a correct sampler never meets it.
 */
class ProposalLimitTest {

  private static RandomGenerator rng(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  /**
   * The full conditional of the logit {@code effect[1]} of the seedlings model that hung a fit
   * (issue 14): five binomial trays, one of 1e15 trials, under a normal(4.696, 0.264) prior. Left
   * of the start u = 4.68 the log-likelihood -1e15 log(1 + e^u) is an exponential wall, so each
   * new tangent reaches about one unit further down it: the fit spent 30 of its 32 abscissae
   * walking to the mode near u = -28.2, and the tangents that bracket the mode (at -28.41 and
   * -27.90, curvature about 600) leave the hull about 600 x 0.5^2 / 8 = 19 nats above the density
   * (an acceptance near 1e-8) with no abscissa left to close the gap.
   */
  private static DifferentiableLogDensity stuckConditional() {
    double[][] trays = {{1e15, 16}, {25, 14}, {24, 16}, {30, 16}, {29, 19}};
    double mean = 4.696475537448275;
    double variance = 0.2638029696925108 * 0.2638029696925108;
    return u -> {
      // log(1 + e^u) and 1 / (1 + e^-u) without overflow
      double softplus = u > 0 ? u + Math.log1p(Math.exp(-u)) : Math.log1p(Math.exp(u));
      double p = u > 0 ? 1 / (1 + Math.exp(-u)) : Math.exp(u) / (1 + Math.exp(u));
      double value = -(u - mean) * (u - mean) / (2 * variance);
      double slope = -(u - mean) / variance;
      for (double[] tray : trays) {
        value += tray[1] * u - tray[0] * softplus;
        slope += tray[1] - tray[0] * p;
      }
      return new Evaluation(value, slope);
    };
  }

  /** The 32 abscissae the stuck fit had when it stopped adding (read from its hull). */
  private static final double[] STUCK_ABSCISSAE = {
    -59.32058871584751, -29.196822895905697, -28.409549387654167, -27.895853674332603,
    -27.201919905543935, -26.368471716290035, -24.872868312085775, -23.70477249004029,
    -22.64179955791386, -21.617285479366185, -20.6077419204231, -19.60393283789876,
    -18.598049289303937, -17.597445571206862, -16.59602473207051, -15.595426878855767,
    -14.593993200468088, -13.590353339975119, -12.589964106890621, -11.589273918838883,
    -10.58907405727097, -9.58896031151704, -8.58781484186794, -7.586210983622245,
    -6.58540273929182, -5.5785904474574295, -4.572883480032616, -3.557357502858895,
    -2.518027867655987, -1.403135766624687, -0.023887781372939735, 5.679411284152489
  };

  @Test
  void aDrawFromAnExhaustedHullFarAboveTheDensityGivesUpWithTheHullInTheMessage() {
    HullOptions options =
        HullOptions.defaults().withMaximumHullSize(32).withStartingAbscissae(STUCK_ABSCISSAE);
    AdaptiveRejectionSampler sampler =
        AdaptiveRejectionSampler.withDerivatives(stuckConditional(), Support.real(), options);
    ProposalLimitException stuck =
        assertTimeoutPreemptively(
            Duration.ofMinutes(2),
            () -> assertThrows(ProposalLimitException.class, () -> sampler.sample(rng(1))));
    assertEquals(HullOptions.DEFAULT_MAXIMUM_PROPOSALS, stuck.proposals());
    assertEquals(32, stuck.abscissae().length);
    assertEquals(32, stuck.values().length);
    assertTrue(stuck.getMessage().contains("no proposal accepted in 100000 proposals"),
        stuck.getMessage());
    assertTrue(Double.isFinite(stuck.x()), "the last proposal is named");
    double highest = java.util.Arrays.stream(stuck.values()).max().orElseThrow();
    assertTrue(stuck.getMessage().contains("highest log-density at an abscissa " + highest + ")"),
        stuck.getMessage());
  }

  @Test
  void theCapIsPerDrawSoACorrectSamplerNeverMeetsIt() {
    // a standard normal: adaptive rejection accepts a proposal with probability above 0.5 from the
    // first one (common practice), so a cap of 40 is met with probability below 2^-40 per draw,
    // about 1e-7 over these 100000 draws; a cap counted over the sampler's life would fail at once
    AdaptiveRejectionSampler sampler =
        AdaptiveRejectionSampler.withDerivatives(
            x -> new Evaluation(-0.5 * x * x, -x), Support.real(),
            HullOptions.defaults().withMaximumProposals(40));
    RandomGenerator rng = rng(2);
    for (int i = 0; i < 100_000; i++) {
      sampler.sample(rng);
    }
    assertTrue(sampler.statistics().proposals() > 40);
  }

  @Test
  void theCapIsAnOptionThatKeepsTheOthers() {
    HullOptions options = HullOptions.defaults().withMaximumHullSize(10).withMaximumProposals(7);
    assertEquals(7, options.maximumProposals());
    assertEquals(10, options.maximumHullSize());
    assertEquals(7, options.withLogConcavityTolerance(1e-6).withAutomaticStart(1, 2)
        .withStartingAbscissae(0, 1).withMaximumSearchSteps(3).withMaximumHullSize(5)
        .maximumProposals());
    assertEquals(100_000, HullOptions.defaults().maximumProposals());
    assertThrows(IllegalArgumentException.class, () -> options.withMaximumProposals(0));
  }
}
