package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.Combinators;
import net.jqwik.api.EdgeCasesMode;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import org.hullbound.model.family.FamilyCases.Case;
import org.hullbound.model.family.FamilyCases.Point;

/**
 * {@code logProbabilityBetween} equals differences of commons-math3 3.6.1 distribution functions
 * where those are accurate, and its gradient equals central finite differences of itself.
 */
class TruncationProperties {

  /** An interval of a case: both ends generated in the support, one end sometimes infinite. */
  record Interval(Case testCase, double[] args, double lo, double hi) {
    Parametrisation p() {
      return testCase.parametrisation();
    }

    @Override
    public String toString() {
      return testCase.label() + " args=" + java.util.Arrays.toString(args) + " [" + lo + ", " + hi + "]";
    }
  }

  @Provide
  Arbitrary<Interval> intervals() {
    return Arbitraries.of(FamilyCases.CASES).flatMap(c -> Combinators.combine(
            c.args(), FamilyCases.uniform(0.001, 0.999), FamilyCases.uniform(0.001, 0.999),
            Arbitraries.integers().between(0, 3))
        .as((a, q1, q2, open) -> {
          double x1 = c.values().value(a, Math.min(q1, q2));
          double x2 = c.values().value(a, Math.max(q1, q2));
          double lo = open == 1 ? Double.NEGATIVE_INFINITY : x1;
          double hi = open == 2 ? Double.POSITIVE_INFINITY : x2;
          return new Interval(c, a, lo, hi);
        }))
        .filter(i -> i.p().discrete() ? i.lo() <= i.hi() : wideEnough(i));
  }

  /**
   * Intervals narrower than a thousandth of the density's spread are left out: there {@code F(hi) -
   * F(lo)} itself is ill-conditioned (relative error about 1e-16 F/P in any method from distribution
   * functions), which a finite difference of it magnifies.
   */
  private static boolean wideEnough(Interval i) {
    if (!(i.lo() < i.hi())) {
      return false;
    }
    if (Double.isInfinite(i.lo()) || Double.isInfinite(i.hi())) {
      return true;
    }
    double width = i.testCase().width().at(i.lo(), i.args());
    return i.hi() - i.lo() > 1e-3 * width;
  }

  private static double referenceProbability(Interval i) {
    FamilyCases.Reference cdf = i.testCase().cdf();
    if (i.p().discrete()) {
      // P(lo <= X <= hi) = F(hi) - F(lo - 1) on whole numbers.
      double upper = Double.isInfinite(i.hi()) ? 1.0 : cdf.at(i.hi(), i.args());
      double lower = Double.isInfinite(i.lo()) ? 0.0 : cdf.at(i.lo() - 1, i.args());
      return upper - lower;
    }
    double upper = Double.isInfinite(i.hi()) ? 1.0 : cdf.at(i.hi(), i.args());
    double lower = Double.isInfinite(i.lo()) ? 0.0 : cdf.at(i.lo(), i.args());
    return upper - lower;
  }

  @Property(tries = 2000, seed = "20261211", edgeCases = EdgeCasesMode.NONE)
  void probabilityEqualsDifferenceOfReferenceDistributionFunctions(@ForAll("intervals") Interval i) {
    if (i.testCase().cdf() == null) {
      return;
    }
    double[] gradient = new double[i.args().length];
    double logP = i.p().logProbabilityBetween(i.lo(), i.hi(), i.args(), gradient);
    double expected = referenceProbability(i);
    // commons-math3 distribution functions are accurate to about 1e-14 absolute.
    assertEquals(expected, Math.exp(logP), 1e-12 + 1e-9 * expected,
        () -> i + " against " + i.testCase().source());
  }

  @Property(tries = 2000, seed = "20261212", edgeCases = EdgeCasesMode.NONE)
  void gradientEqualsFiniteDifferences(@ForAll("intervals") Interval i) {
    Parametrisation p = i.p();
    double[] args = i.args();
    double[] gradient = new double[args.length];
    double logP = p.logProbabilityBetween(i.lo(), i.hi(), args, gradient);
    double mid = Double.isInfinite(i.lo()) ? i.hi() : Double.isInfinite(i.hi()) ? i.lo() : 0.5 * (i.lo() + i.hi());
    Point at = new Point(i.testCase(), args, mid);
    for (int k = 0; k < args.length; k++) {
      String name = p.argumentNames().get(k);
      if (FamilyCases.wholeArgument(p, k)) {
        assertEquals(0.0, gradient[k], i::toString);
        continue;
      }
      int index = k;
      double h = stepFor(i, at, k);
      double numeric = Differences.derivative(
          t -> p.logProbabilityBetween(i.lo(), i.hi(), Differences.with(args, index, t), new double[args.length]),
          args[k], h);
      double tolerance = 1e-5 * Math.max(1, Math.abs(gradient[k])) + 1e-11 * (1 + Math.abs(logP)) / h;
      assertTrue(Math.abs(gradient[k] - numeric) <= tolerance,
          i + " d/d" + name + ": analytic " + gradient[k] + ", finite difference " + numeric);
    }
  }

  /** Steps for location-like arguments must not move a bound of the support across an end. */
  private static double stepFor(Interval i, Point at, int k) {
    String name = i.p().argumentNames().get(k);
    if (name.equals("lower") || name.equals("upper")) {
      double[] a = i.args();
      double room = a[1] - a[0];
      for (double end : new double[] {i.lo(), i.hi()}) {
        if (Double.isFinite(end)) {
          room = Math.min(room, Math.abs(end - a[k]));
        }
      }
      return 1e-4 * room;
    }
    if (name.equals("mean") || name.equals("location")) {
      return i.p().discrete() ? 1e-4 * i.args()[k] : 1e-4 * i.testCase().width().at(at.x(), i.args());
    }
    return Differences.argumentStep(at, k, 1e-4);
  }
}
