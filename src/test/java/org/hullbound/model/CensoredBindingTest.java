package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import org.apache.commons.math3.distribution.GammaDistribution;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.distribution.WeibullDistribution;
import org.hullbound.lang.Parser;
import org.junit.jupiter.api.Test;

/**
 * Good model files with a {@code censored} clause: what binding makes of them (which rows are
 * censored, which are exact or imputed), the joint log-density against the model restated by hand
 * with commons-math3 3.6.1 distributions, and the update each unknown gets.
 */
class CensoredBindingTest {

  private static BoundModel bind(String model, String csv) {
    String[] lines = csv.split("\n");
    List<List<String>> rows = Arrays.stream(lines).skip(1)
        .map(line -> Arrays.asList(line.split(",", -1))).toList();
    DataTable table = DataTable.of("data.csv", Arrays.asList(lines[0].split(",")), rows);
    return BoundModel.bind(Parser.parse("model.hbm", model), List.of(table));
  }

  private static final String SEALS = """
      index seal
      data  running[seal]
      data  hours[seal] ~ weibull(shape = k, scale = s) censored hours[seal] .. inf when running[seal]
      param k ~ gamma(shape = 2, rate = 1)
      param s ~ gamma(shape = 2, rate = 0.5)
      """;

  /**
   * An exact seal adds the Weibull log-density; a running one the log of the survival function
   * {@code -(hours / s)^k} (Johnson, Kotz and Balakrishnan 1994, vol. 1, ch. 21); an exact row
   * with an empty value is a missing observation, imputed as usual.
   */
  @Test
  void rightCensoredRowsAddTheLogSurvivalFunction() {
    BoundModel model = bind(SEALS, "hours,running\n1.5,0\n2.0,1\n0.7,0\n3.1,1\n,0\n");
    assertEquals(List.of("k", "s", "hours[5]"),
        model.unknowns().stream().map(Unknown::label).toList());
    double k = 1.7;
    double s = 2.4;
    double missing = 0.9;
    WeibullDistribution w = new WeibullDistribution(null, k, s);
    double expected = new GammaDistribution(null, 2, 1).logDensity(k)
        + new GammaDistribution(null, 2, 2).logDensity(s)
        + w.logDensity(1.5) + w.logDensity(0.7) + w.logDensity(missing)
        - Math.pow(2.0 / s, k) - Math.pow(3.1 / s, k);
    assertEquals(expected, model.logDensity(new double[] {k, s, missing}), 1e-12 * Math.abs(expected));
  }

  @Test
  void bothUnknownsGetAdaptiveRejectionThroughTheCensoredRules() {
    BoundModel model = bind(SEALS, "hours,running\n1.5,0\n2.0,1\n0.7,0\n3.1,1\n");
    Update shape = model.update(0);
    Update scale = model.update(1);
    assertInstanceOf(Update.AdaptiveRejection.class, shape, shape.reason());
    assertInstanceOf(Update.AdaptiveRejection.class, scale, scale.reason());
    assertTrue(shape.reason().contains("censored weibull terms concave in shape (a censored term"), shape.reason());
    assertTrue(scale.reason().contains("censored weibull terms concave in log(scale)"), scale.reason());
  }

  /**
   * Interval censoring inside a truncation: the row adds {@code log(F(b) - F(max(a, 0)))} and,
   * as the mean is unknown, the truncation normaliser {@code -log(1 - F(0))}; a censored row's
   * value cell is not read, so it may be empty without making an unknown.
   */
  @Test
  void intervalCensoringInsideATruncation() {
    BoundModel model = bind("""
        index i
        data lo[i], hi[i]
        data y[i] ~ normal(mean = m, sd = 2) within 0 .. inf censored lo[i] .. hi[i]
        param m ~ normal(mean = 0, sd = 10)
        """, "y,lo,hi\n,-1,1.5\n7,2,9\n");
    assertEquals(List.of("m"), model.unknowns().stream().map(Unknown::label).toList());
    double m = 1.3;
    NormalDistribution n = new NormalDistribution(null, m, 2);
    double normaliser = Math.log(1 - n.cumulativeProbability(0));
    double expected = new NormalDistribution(null, 0, 10).logDensity(m)
        + Math.log(n.cumulativeProbability(1.5) - n.cumulativeProbability(0)) - normaliser
        + Math.log(n.cumulativeProbability(9) - n.cumulativeProbability(2)) - normaliser;
    assertEquals(expected, model.logDensity(new double[] {m}), 1e-12 * Math.abs(expected));
    // The truncation normaliser moves with m: no rule covers that, so the fallback.
    assertInstanceOf(Update.Fallback.class, model.update(0), model.update(0).reason());
  }

  /** Left censoring at a detection limit: meanlog by adaptive rejection, sdlog by the fallback. */
  @Test
  void leftCensoredLognormalAtADetectionLimit() {
    BoundModel model = bind("""
        index well
        data limit[well], below[well]
        data nitrate[well] ~ lognormal(meanlog = centre, sdlog = spread) censored 0 .. limit[well] when below[well]
        param centre ~ normal(mean = 0, sd = 3)
        param spread ~ half-normal(sd = 2)
        """, "nitrate,limit,below\n2.5,0.5,0\n,0.5,1\n0.8,0.5,0\n");
    assertInstanceOf(Update.AdaptiveRejection.class, model.update(0), model.update(0).reason());
    Update spread = model.update(1);
    assertInstanceOf(Update.Fallback.class, spread, spread.reason());
    assertTrue(spread.reason().contains("no rule shows a censored lognormal term log-concave"), spread.reason());
    double centre = 0.2;
    double sd = 0.9;
    NormalDistribution logs = new NormalDistribution(null, centre, sd);
    double expected = new NormalDistribution(null, 0, 3).logDensity(centre)
        + Math.log(2) + new NormalDistribution(null, 0, 2).logDensity(sd)
        + new org.apache.commons.math3.distribution.LogNormalDistribution(null, centre, sd).logDensity(2.5)
        + new org.apache.commons.math3.distribution.LogNormalDistribution(null, centre, sd).logDensity(0.8)
        + Math.log(logs.cumulativeProbability(Math.log(0.5)));
    assertEquals(expected, model.logDensity(new double[] {centre, sd}), 1e-12 * Math.abs(expected));
  }
}
