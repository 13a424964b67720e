package org.hullbound.report;

import java.time.Duration;
import java.time.OffsetDateTime;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.List;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.hullbound.diagnostics.Draws;
import org.hullbound.diagnostics.VariableSummary;

/**
 * Invented report inputs for the tests: autoregressive chains of known shape, a fixed seed, and a
 * fixed start time, so every rendering is reproducible.
 */
final class SampleReports {
  private SampleReports() {}

  static final OffsetDateTime STARTED =
      OffsetDateTime.of(2026, 3, 14, 9, 26, 53, 0, ZoneOffset.UTC);

  /** {@code chains} AR(1) chains with stationary mean, sd and lag-one correlation {@code phi}. */
  static double[][] ar1(long seed, int chains, int n, double mean, double sd, double phi) {
    RandomGenerator.SplittableGenerator root =
        (RandomGenerator.SplittableGenerator)
            RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
    double innovation = sd * Math.sqrt(1 - phi * phi);
    double[][] draws = new double[chains][n];
    for (int c = 0; c < chains; c++) {
      RandomGenerator rng = root.split();
      double x = rng.nextGaussian() * sd;
      for (int i = 0; i < n; i++) {
        x = phi * x + innovation * rng.nextGaussian();
        draws[c][i] = mean + x;
      }
    }
    return draws;
  }

  static RunHeader header(String model, int chains, int draws) {
    return new RunHeader(model, STARTED, chains, draws, 500, 20260314L, Duration.ofMillis(12_345));
  }

  /** A report of {@code count} well-mixed unknowns named {@code theta[1]}, ... */
  static ReportInput mixed(int count, int chains, int draws, ReportOptions options) {
    List<UnknownReport> unknowns = new ArrayList<>();
    for (int k = 0; k < count; k++) {
      double[][] d = ar1(1000 + k, chains, draws, k * 0.5, 1 + 0.1 * k, 0.5);
      unknowns.add(
          UnknownReport.of(
              "theta[" + (k + 1) + "]", d, UpdateFacts.exact("adaptive rejection", 4.2)));
    }
    return new ReportInput(
        header("invented dose-response model", chains, draws), List.of(), "", unknowns, options);
  }

  /**
   * {@code count} unknowns with real draws but a made-up summary (the plots do not read it), so
   * large reports can be rendered in tests without the cost of the diagnostics.
   */
  static ReportInput cheap(int count, int chains, int draws, ReportOptions options) {
    List<UnknownReport> unknowns = new ArrayList<>();
    for (int k = 0; k < count; k++) {
      double[][] d = ar1(5000 + k, chains, draws, 0, 1, 0.6);
      VariableSummary summary =
          new VariableSummary(
              "beta[" + (k + 1) + "]",
              chains,
              draws,
              0.01,
              1.0,
              -1.96,
              0.0,
              1.96,
              1.001,
              1.001,
              1.0,
              900,
              850,
              950,
              0.03,
              0.05,
              0.04,
              0.05,
              VariableSummary.State.COMPLETE,
              List.of());
      unknowns.add(
          UnknownReport.of(summary, Draws.of(d), UpdateFacts.exact("adaptive rejection", 4.0)));
    }
    return new ReportInput(
        header("invented growth curves", chains, draws), List.of(), "", unknowns, options);
  }

  /** An entry whose summary is made up, to test the plots alone on draws of any kind. */
  static UnknownReport madeUp(String name, double[][] draws) {
    double nan = Double.NaN;
    VariableSummary summary =
        new VariableSummary(
            name, draws.length, draws[0].length, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan,
            nan, nan, nan, nan, nan, VariableSummary.State.COMPLETE, List.of());
    return UnknownReport.of(summary, Draws.of(draws), null);
  }

  /** A showcase with one of each awkward case, for looking at and for the browser. */
  static ReportInput showcase() {
    List<UnknownReport> unknowns = new ArrayList<>();
    unknowns.add(
        UnknownReport.of(
            "mu", ar1(1, 4, 2000, 2.5, 0.4, 0.3), UpdateFacts.exact("conjugate normal", 0)));
    unknowns.add(
        UnknownReport.of(
            "sigma", ar1(2, 4, 2000, 1.2, 0.1, 0.9), UpdateFacts.exact("adaptive rejection", 5.7)));
    double[][] stuck = ar1(3, 4, 2000, 0, 1, 0.95);
    for (int i = 0; i < stuck[2].length; i++) {
      stuck[2][i] += 3;
    }
    unknowns.add(
        UnknownReport.of("tau <&> \"odd\"", stuck, UpdateFacts.exact("adaptive rejection", 6.1)));
    double[][] constant = new double[4][50];
    for (double[] chain : constant) {
      java.util.Arrays.fill(chain, 3.0);
    }
    unknowns.add(UnknownReport.of("fixed", constant, UpdateFacts.exact("point mass", 0)));
    double[][] gaps = ar1(4, 4, 500, 0, 1, 0.2);
    gaps[1][17] = Double.NaN;
    gaps[3][200] = Double.POSITIVE_INFINITY;
    unknowns.add(UnknownReport.of("broken", gaps, UpdateFacts.fallback("slice", 12.5)));
    unknowns.add(
        UnknownReport.of(
            "one draw", new double[][] {{0.7}}, UpdateFacts.exact("adaptive rejection", 3.0)));
    List<String> warnings =
        List.of(
            "tau <&> \"odd\": R-hat is 1.41, above 1.01: chain 3 sits apart from the others; run"
                + " longer or check the model.",
            "broken: 2 draws are NaN or infinite; no diagnostics for it.");
    return new ReportInput(
        header("invented reef survey <&>", 4, 2000),
        warnings,
        "2 of 6 unknowns need attention (see above); the others look converged.",
        unknowns,
        ReportOptions.defaults());
  }

  /**
   * An invented hierarchical fit: {@code mu}, {@code tau} whose draws follow mu's closely (a
   * correlation near 0.97, with a slow chain), twelve {@code effect[j]} and the model text and data
   * facts; for the question layout, interval plots and pair plots.
   */
  static ReportInput hierarchical() {
    List<UnknownReport> unknowns = new ArrayList<>();
    double[][] mu = ar1(11, 4, 1000, 1.0, 0.5, 0.97);
    double[][] tau = ar1(12, 4, 1000, 0, 0.12, 0.3);
    for (int c = 0; c < tau.length; c++) {
      for (int i = 0; i < tau[c].length; i++) {
        tau[c][i] += 2 + 0.5 * mu[c][i];
      }
    }
    unknowns.add(UnknownReport.of("mu", mu, UpdateFacts.exact("conjugate normal", 0)));
    unknowns.add(UnknownReport.of("tau", tau, UpdateFacts.exact("adaptive rejection", 5.2)));
    for (int j = 1; j <= 12; j++) {
      unknowns.add(
          UnknownReport.of(
              "effect[" + j + "]",
              ar1(20 + j, 4, 1000, Math.sin(j) * 2, 0.3 + 0.05 * j, 0.4),
              UpdateFacts.exact("adaptive rejection", 4.4)));
    }
    RunSources sources =
        new RunSources(
            "# invented scenario\n"
                + "model schools\n"
                + "index school\n"
                + "data  score[school], se[school]\n"
                + "param mu ~ normal(mean = 0, sd = 10)\n"
                + "param tau ~ half-normal(sd = 5)\n"
                + "param effect[school] ~ normal(mean = mu, sd = tau)\n"
                + "data  score[school] ~ normal(mean = effect[school], sd = se[school])\n",
            List.of(
                new RunSources.DataSource("schools.csv", 12, 1),
                new RunSources.DataSource("inline", 1, 0)));
    return new ReportInput(
            new RunHeader(
                "invented schools", STARTED, 4, 1000, 500, -8_765_432_109_876_543_210L,
                Duration.ofMillis(4_321)),
            List.of(),
            "All 14 unknowns look converged.",
            unknowns,
            ReportOptions.defaults())
        .withSources(sources);
  }
}
