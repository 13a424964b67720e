package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import net.jqwik.api.Arbitrary;
import net.jqwik.api.EdgeCasesMode;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import org.hullbound.model.family.FamilyCases.Point;

/**
 * Every parametrisation's log-density equals its reference (commons-math3 3.6.1, or the handbook
 * form named in {@link FamilyCases}), and its gradient equals central finite differences.
 */
class LogDensityProperties {

  @Provide
  Arbitrary<Point> points() {
    return FamilyCases.points();
  }

  @Property(tries = 3000, seed = "20261201", edgeCases = EdgeCasesMode.NONE)
  void logDensityEqualsTheReference(@ForAll("points") Point point) {
    double expected = point.testCase().logDensity().at(point.x(), point.args());
    double actual = point.p().logDensity(point.x(), point.args());
    // Reference named in the case (commons-math3 or a handbook closed form); relative 1e-10.
    assertEquals(expected, actual, 1e-10 * Math.max(1, Math.abs(expected)),
        () -> point + " against " + point.testCase().source());
  }

  @Property(tries = 3000, seed = "20261202", edgeCases = EdgeCasesMode.NONE)
  void gradientCallGivesTheSameValue(@ForAll("points") Point point) {
    double[] gradient = new double[1 + point.args().length];
    assertEquals(point.p().logDensity(point.x(), point.args()),
        point.p().logDensity(point.x(), point.args(), gradient), 0.0, point::toString);
  }

  @Property(tries = 3000, seed = "20261203", edgeCases = EdgeCasesMode.NONE)
  void gradientEqualsFiniteDifferences(@ForAll("points") Point point) {
    Parametrisation p = point.p();
    double[] args = point.args();
    double x = point.x();
    double[] gradient = new double[1 + args.length];
    double value = p.logDensity(x, args, gradient);
    if (p.discrete()) {
      assertEquals(0.0, gradient[0], point::toString);
    } else {
      double h = 1e-4 * point.testCase().width().at(x, args);
      double numeric = Differences.derivative(t -> p.logDensity(t, args), x, h);
      assertClose(gradient[0], numeric, value, h, point + " d/dx");
    }
    for (int k = 0; k < args.length; k++) {
      if (FamilyCases.wholeArgument(p, k)) {
        assertEquals(0.0, gradient[1 + k], point::toString);
        continue;
      }
      int index = k;
      double h = Differences.argumentStep(point, k, 1e-4);
      double numeric = Differences.derivative(t -> p.logDensity(x, Differences.with(args, index, t)), args[k], h);
      assertClose(gradient[1 + k], numeric, value, h, point + " d/d" + p.argumentNames().get(k));
    }
  }

  static void assertClose(double analytic, double numeric, double value, double h, String what) {
    double tolerance = 1e-6 * Math.max(1, Math.abs(analytic)) + 1e-11 * (1 + Math.abs(value)) / h;
    assertTrue(Math.abs(analytic - numeric) <= tolerance,
        what + ": analytic " + analytic + ", finite difference " + numeric + ", tolerance " + tolerance);
  }
}
