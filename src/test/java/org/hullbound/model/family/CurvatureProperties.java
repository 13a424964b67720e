package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.function.DoubleUnaryOperator;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.EdgeCasesMode;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import org.hullbound.model.family.FamilyCases.Point;

/**
 * Every curvature fact that claims concavity holds numerically: the second difference of the
 * log-density on the stated scale (with the Jacobian for the value, without for arguments) is at
 * most its rounding error, at generated points, with all arguments known and with all unknown.
 * (A concave function has non-positive second differences at every step size; common practice.)
 */
class CurvatureProperties {

  @Provide
  Arbitrary<Point> points() {
    return FamilyCases.points();
  }

  private static double[] allUnknown(int n) {
    double[] unknown = new double[n];
    Arrays.fill(unknown, Double.NaN);
    return unknown;
  }

  @Property(tries = 3000, seed = "20261231", edgeCases = EdgeCasesMode.NONE)
  void concaveInValueClaimsHold(@ForAll("points") Point point) {
    Parametrisation p = point.p();
    if (p.discrete()) {
      return;
    }
    double width = point.testCase().width().at(point.x(), point.args());
    for (Scale scale : Scale.values()) {
      for (double[] known : new double[][] {point.args(), allUnknown(point.args().length)}) {
        Curvature fact = p.curvatureInValue(scale, known);
        if (fact.concave()) {
          checkValue(point, scale, width, fact);
        }
      }
    }
  }

  private static void checkValue(Point point, Scale scale, double width, Curvature fact) {
    Parametrisation p = point.p();
    double[] args = point.args();
    double x = point.x();
    switch (scale) {
      case NATURAL -> assertConcaveAt(t -> p.logDensity(t, args), x, 0.01 * width, point, scale + " value", fact);
      case LOG -> {
        double positive = Math.abs(x);
        if (positive == 0 || p.logDensity(positive, args) == Double.NEGATIVE_INFINITY) {
          return;
        }
        double h = Math.min(0.1, 0.01 * width / positive);
        // Jacobian of value = exp(u): + u.
        assertConcaveAt(u -> p.logDensity(Math.exp(u), args) + u, Math.log(positive), h, point, scale + " value", fact);
      }
      case LOGIT -> {
        if (!(x > 0 && x < 1)) {
          return;
        }
        double h = Math.min(0.1, 0.01 * width / (x * (1 - x)));
        // Jacobian of value = expit(u): + log v + log(1 - v).
        assertConcaveAt(u -> {
          double v = LogSpace.invLogit(u);
          return p.logDensity(v, args) + LogSpace.logInvLogit(u) + LogSpace.logInvLogit(-u);
        }, Math.log(x / (1 - x)), h, point, scale + " value", fact);
      }
    }
  }

  @Property(tries = 3000, seed = "20261232", edgeCases = EdgeCasesMode.NONE)
  void concaveInArgumentClaimsHold(@ForAll("points") Point point) {
    Parametrisation p = point.p();
    double[] args = point.args();
    for (int k = 0; k < args.length; k++) {
      for (Scale scale : Scale.values()) {
        double[] othersKnown = args.clone();
        othersKnown[k] = Double.NaN;
        for (double[] known : new double[][] {othersKnown, allUnknown(args.length)}) {
          Curvature fact = p.curvatureInArgument(k, scale, known);
          if (fact.concave()) {
            checkArgument(point, k, scale, fact);
          }
        }
      }
    }
  }

  private static void checkArgument(Point point, int k, Scale scale, Curvature fact) {
    Parametrisation p = point.p();
    double[] args = point.args();
    double x = point.x();
    double theta = args[k];
    String what = scale + " " + p.argumentNames().get(k);
    switch (scale) {
      case NATURAL -> {
        DoubleUnaryOperator toArgument = t -> t;
        checkArgumentOn(point, k, toArgument, theta, Differences.argumentStep(point, k, 0.01), what, fact);
      }
      case LOG -> {
        if (theta > 0) {
          checkArgumentOn(point, k, Math::exp, Math.log(theta), 0.01, what, fact);
        }
      }
      case LOGIT -> {
        if (theta > 0 && theta < 1) {
          checkArgumentOn(point, k, LogSpace::invLogit, Math.log(theta / (1 - theta)), 0.01, what, fact);
        }
      }
    }
  }

  /** Shrinks the step until both neighbours are valid arguments (e.g. p = exp(u) stays <= 1). */
  private static void checkArgumentOn(Point point, int k, DoubleUnaryOperator toArgument, double u, double h,
      String what, Curvature fact) {
    Parametrisation p = point.p();
    double[] args = point.args();
    double step = h;
    while (p.checkArguments(Differences.with(args, k, toArgument.applyAsDouble(u + step))) != null
        || p.checkArguments(Differences.with(args, k, toArgument.applyAsDouble(u - step))) != null) {
      step /= 2;
    }
    assertConcaveAt(v -> p.logDensity(point.x(), Differences.with(args, k, toArgument.applyAsDouble(v))), u, step,
        point, what, fact);
  }

  private static void assertConcaveAt(DoubleUnaryOperator g, double u, double h, Point point, String what, Curvature fact) {
    double second = Differences.secondDifference(g, u, h);
    double rounding = Differences.secondDifferenceRounding(g, u, h);
    assertTrue(Double.isNaN(second) ? false : second <= rounding,
        point + " " + what + ": second difference " + second + " > " + rounding + " though the fact says: " + fact.reason());
  }
}
