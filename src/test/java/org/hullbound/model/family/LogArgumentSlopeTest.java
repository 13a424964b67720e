package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Set;
import org.junit.jupiter.api.Test;

/**
 * {@link Parametrisation#logArgumentSlope}: {@code a d/da} of the log density. Where the product
 * of the argument and the gradient is finite it must agree with it (the chain rule); at a tiny
 * scale, where the gradient overflows, the overriding forms stay finite and equal the closed form
 * (for a normal with sd s, {@code s d/ds (-log s - z^2/2) = z^2 - 1}).
 */
class LogArgumentSlopeTest {

  private static Parametrisation form(String family, String... arguments) {
    return Families.lookup(family).orElseThrow().match(Set.of(arguments)).orElseThrow();
  }

  private static double slope(Parametrisation p, double x, double[] args, int k) {
    double[] g = new double[args.length + 1];
    p.logDensity(x, args, g);
    return p.logArgumentSlope(x, args, k, g);
  }

  private static double product(Parametrisation p, double x, double[] args, int k) {
    double[] g = new double[args.length + 1];
    p.logDensity(x, args, g);
    return args[k] * g[1 + k];
  }

  @Test
  void agreesWithTheChainRuleAtModerateArguments() {
    Object[][] cases = {
      {form("normal", "mean", "sd"), 1.3, new double[] {0.2, 0.7}, 1},
      {form("normal", "mean", "var"), 1.3, new double[] {0.2, 0.5}, 1},
      {form("normal", "mean", "precision"), 1.3, new double[] {0.2, 2.0}, 1},
      {form("half-normal", "sd"), 1.3, new double[] {0.7}, 0},
      {form("lognormal", "meanlog", "sdlog"), 1.3, new double[] {0.2, 0.7}, 1},
      {form("student-t", "df", "location", "scale"), 1.3, new double[] {3, 0.2, 0.7}, 2},
      {form("normal", "mean", "sd"), 1.3, new double[] {0.2, 0.7}, 0},
      {form("gamma", "shape", "rate"), 1.3, new double[] {2.5, 0.7}, 1},
      {form("gamma", "shape", "scale"), 1.3, new double[] {2.5, 0.7}, 1},
      {form("inverse-gamma", "shape", "scale"), 1.3, new double[] {2.5, 0.7}, 1},
      {form("weibull", "shape", "scale"), 1.3, new double[] {1.5, 0.7}, 1},
      {form("gamma", "shape", "rate"), 1.3, new double[] {2.5, 0.7}, 0},
    };
    for (Object[] c : cases) {
      Parametrisation p = (Parametrisation) c[0];
      double x = (double) c[1];
      double[] args = (double[]) c[2];
      int k = (int) c[3];
      double expected = product(p, x, args, k);
      assertEquals(expected, slope(p, x, args, k), 1e-12 * Math.max(1, Math.abs(expected)),
          p.signature() + " argument " + k);
    }
  }

  @Test
  void staysFiniteWhereTheGradientOverflows() {
    double s = Math.exp(-330);
    double z = (1.0 - 0.2) / s;
    assertEquals(Double.POSITIVE_INFINITY, product(form("normal", "mean", "sd"), 1.0,
        new double[] {0.2, s}, 1), "the default would overflow here");
    assertEquals(z * z - 1, slope(form("normal", "mean", "sd"), 1.0, new double[] {0.2, s}, 1),
        1e-12 * z * z);
    double v = s * s;
    assertEquals(0.5 * (0.64 / v - 1),
        slope(form("normal", "mean", "var"), 1.0, new double[] {0.2, v}, 1), 1e-12 * 0.32 / v);
    double tau = 1 / v;
    assertEquals(0.5 * (1 - tau * 0.64),
        slope(form("normal", "mean", "precision"), 1.0, new double[] {0.2, tau}, 1),
        1e-12 * 0.32 * tau);
    double h = 1.0 / s;
    assertEquals(h * h - 1, slope(form("half-normal", "sd"), 1.0, new double[] {s}, 0),
        1e-12 * h * h);
    double l = (Math.log(2.0) - 0.2) / s;
    assertEquals(l * l - 1,
        slope(form("lognormal", "meanlog", "sdlog"), 2.0, new double[] {0.2, s}, 1),
        1e-12 * l * l);
    assertTrue(Double.isFinite(
        slope(form("student-t", "df", "location", "scale"), 1.0, new double[] {3, 0.2, s}, 2)));
  }

  /**
   * Scales and rates of the gamma, inverse gamma and Weibull at the ends of the double range: the
   * gradient overflows, the log-argument slope keeps its closed form (gamma rate r: shape - r x;
   * gamma scale s: x/s - shape; inverse-gamma scale s: shape - s/x; Weibull scale s: shape (t - 1),
   * t = (x/s)^shape).
   */
  @Test
  void scalesAndRatesStayFiniteWhereTheGradientOverflows() {
    double tiny = Double.MIN_NORMAL / 100;
    Parametrisation byRate = form("gamma", "shape", "rate");
    assertEquals(Double.POSITIVE_INFINITY, product(byRate, 1.0, new double[] {2.5, tiny}, 1),
        "the default would overflow here");
    assertEquals(2.5, slope(byRate, 1.0, new double[] {2.5, tiny}, 1), 1e-12);
    double s = Math.exp(-360);
    Parametrisation byScale = form("gamma", "shape", "scale");
    assertEquals(Double.POSITIVE_INFINITY, product(byScale, 1.0, new double[] {2.5, s}, 1));
    assertEquals(1 / s - 2.5, slope(byScale, 1.0, new double[] {2.5, s}, 1), 1e-12 / s);
    Parametrisation inverse = form("inverse-gamma", "shape", "scale");
    assertEquals(Double.POSITIVE_INFINITY, product(inverse, 1.0, new double[] {2.5, tiny}, 1));
    assertEquals(2.5, slope(inverse, 1.0, new double[] {2.5, tiny}, 1), 1e-12);
    double w = Math.exp(-240);
    Parametrisation weibull = form("weibull", "shape", "scale");
    assertEquals(Double.POSITIVE_INFINITY, product(weibull, 1.0, new double[] {2.0, w}, 1));
    double t = Math.exp(480);
    assertEquals(2.0 * (t - 1), slope(weibull, 1.0, new double[] {2.0, w}, 1), 1e-12 * 2 * t);
  }

  @Test
  void outsideTheSupportTheSlopeIsZero() {
    assertEquals(0, slope(form("lognormal", "meanlog", "sdlog"), -1.0, new double[] {0, 1}, 1));
    assertEquals(0, slope(form("half-normal", "sd"), -1.0, new double[] {1}, 0));
  }
}
