package org.hullbound.model.family;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.DoubleUnaryOperator;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.Combinators;
import net.jqwik.api.EdgeCasesMode;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import org.hullbound.model.family.FamilyCases.Case;
import org.junit.jupiter.api.Test;

/**
 * The log-concavity rules of censored terms ({@link CensoredCurvature}) against numerical second
 * differences: wherever a rule claims concavity in an argument on a scale, the second difference
 * of {@code log P(lo < X <= hi)} in that argument is at most its rounding error, at generated
 * arguments and right, left and interval limits (a concave function has non-positive second
 * differences at every step; common practice). The negative controls show points where the
 * second difference is clearly positive, each in a case the rules leave out, so that the check
 * can see a wrong rule.
 */
class CensoredCurvatureProperties {

  /** A generated censored term: a family's case, its arguments and the limits. */
  record Limits(Case testCase, double[] args, double lo, double hi, String kind) {
    Parametrisation censored() {
      return Censored.of(testCase.parametrisation()).orElseThrow();
    }

    double logP(double[] arguments) {
      double[] all = Arrays.copyOf(arguments, arguments.length + 1);
      all[arguments.length] = hi;
      return censored().logDensity(lo, all);
    }

    @Override
    public String toString() {
      return testCase.label() + " args=" + Arrays.toString(args) + " " + kind + " (" + lo + ", " + hi + "]";
    }
  }

  @Provide
  Arbitrary<Limits> limits() {
    List<Case> continuous = new ArrayList<>();
    for (Case c : FamilyCases.CASES) {
      if (!c.parametrisation().discrete()) {
        continuous.add(c);
      }
    }
    Arbitrary<Double> q = FamilyCases.uniform(0.01, 0.99);
    return Arbitraries.of(continuous).flatMap(c -> Combinators.combine(
            c.args(), q, q, Arbitraries.integers().between(0, 2))
        .as((a, q1, q2, kind) -> {
          double x1 = c.values().value(a, Math.min(q1, q2));
          double x2 = c.values().value(a, Math.max(q1, q2));
          return switch (kind) {
            case 0 -> new Limits(c, a, x1, Double.POSITIVE_INFINITY, "right");
            case 1 -> new Limits(c, a, Double.NEGATIVE_INFINITY, x2, "left");
            default -> new Limits(c, a, x1, x2 > x1 ? x2 : x1 + c.width().at(x1, a), "interval");
          };
        }));
  }

  @Property(tries = 4000, seed = "20261202", edgeCases = EdgeCasesMode.NONE)
  void everyClaimedConcavityHolds(@ForAll("limits") Limits limits) {
    Parametrisation censored = limits.censored();
    double[] args = limits.args();
    if (!Double.isFinite(limits.logP(args))) {
      return;
    }
    for (int k = 0; k < args.length; k++) {
      for (Scale scale : Scale.values()) {
        double[] known = args.clone();
        known[k] = Double.NaN;
        Curvature fact = censored.curvatureInArgument(k, scale, known);
        if (!fact.concave()) {
          continue;
        }
        int argument = k;
        DoubleUnaryOperator toArgument = scale == Scale.LOG ? Math::exp : t -> t;
        double u = scale == Scale.LOG ? Math.log(args[k]) : args[k];
        double h = scale == Scale.LOG ? 0.01 : stepFor(limits, k);
        DoubleUnaryOperator g =
            v -> limits.logP(Differences.with(args, argument, toArgument.applyAsDouble(v)));
        double second = Differences.secondDifference(g, u, h);
        double rounding = Differences.secondDifferenceRounding(g, u, h);
        assertTrue(second <= rounding, limits + " " + scale + " "
            + censored.argumentNames().get(k) + ": second difference " + second + " > " + rounding
            + " though the rule says: " + fact.reason());
      }
    }
  }

  private static double stepFor(Limits limits, int k) {
    String name = limits.testCase().parametrisation().argumentNames().get(k);
    double value = limits.args()[k];
    return switch (name) {
      case "mean", "location" -> 0.01 * limits.testCase().width().at(
          Double.isFinite(limits.lo()) ? limits.lo() : limits.hi(), limits.args());
      case "meanlog" -> 0.01 * limits.args()[1];
      default -> 0.01 * value;
    };
  }

  /** One negative control: a censored term, the argument moved, the scale, and the point. */
  private record Control(String family, String[] names, double[] args, double lo, double hi,
      int k, Scale scale, String why) {}

  private static final List<Control> CONTROLS = List.of(
      // A narrow interval 5 scales from the location is about the cauchy density there, whose log
      // has second derivative (in the location) 2 (z^2 - 1)/(1 + z^2)^2 > 0 for |z| > 1.
      new Control("cauchy", new String[] {"location", "scale"}, new double[] {5, 1}, -0.01, 0.01,
          0, Scale.NATURAL, "cauchy density not log-concave"),
      // Right-censored weibull in v = log(shape): -exp(s) with s = shape log(c/scale) = e^v L has
      // second derivative -exp(s) s (1 + s), positive for -1 < s < 0 (here s = -0.5).
      new Control("weibull", new String[] {"shape", "scale"}, new double[] {1, 1},
          Math.exp(-0.5), Double.POSITIVE_INFINITY, 0, Scale.LOG, "shape on the log scale"),
      // Right-censored gamma with shape < 1: the survival function of a log-convex density is
      // log-convex (Bagnoli and Bergstrom 2005, Theorem 2), and rate * c is linear in the rate.
      new Control("gamma", new String[] {"shape", "rate"}, new double[] {0.3, 1}, 0.5,
          Double.POSITIVE_INFINITY, 1, Scale.NATURAL, "gamma rate with shape < 1"),
      // A narrow student-t interval far out: the t log-density is convex in its tails.
      new Control("student-t", new String[] {"df", "location", "scale"}, new double[] {3, 6, 1},
          -0.01, 0.01, 1, Scale.NATURAL, "student-t density not log-concave"));

  @Test
  void negativeControlsAreNotClaimedAndAreConvexSomewhere() {
    for (Control c : CONTROLS) {
      Parametrisation observed = FamilyCases.parametrisation(c.family(), c.names());
      Parametrisation censored = Censored.of(observed).orElseThrow();
      double[] known = c.args().clone();
      known[c.k()] = Double.NaN;
      assertFalse(censored.curvatureInArgument(c.k(), c.scale(), known).concave(), c.why());
      double[] all = Arrays.copyOf(c.args(), c.args().length + 1);
      all[c.args().length] = c.hi();
      DoubleUnaryOperator g = v -> {
        double[] moved = all.clone();
        moved[c.k()] = c.scale() == Scale.LOG ? Math.exp(v) : v;
        return censored.logDensity(c.lo(), moved);
      };
      double u = c.scale() == Scale.LOG ? Math.log(c.args()[c.k()]) : c.args()[c.k()];
      double second = Differences.secondDifference(g, u, 0.01);
      assertTrue(second > 100 * Differences.secondDifferenceRounding(g, u, 0.01),
          c.why() + ": second difference " + second + " should be clearly positive");
    }
  }

  /** The rules the brief names hold and say why (names as {@code check} prints them). */
  @Test
  void theNamedRulesAreClaimed() {
    assertConcave("normal", new String[] {"mean", "sd"}, 0, Scale.NATURAL, new double[] {0, 1});
    assertConcave("lognormal", new String[] {"meanlog", "sdlog"}, 0, Scale.NATURAL, new double[] {0, 1});
    assertConcave("weibull", new String[] {"shape", "scale"}, 1, Scale.LOG, new double[] {0.5, 1});
    assertConcave("weibull", new String[] {"shape", "scale"}, 0, Scale.NATURAL, new double[] {0.5, 1});
    assertConcave("gamma", new String[] {"shape", "rate"}, 1, Scale.NATURAL, new double[] {1, 1});
    assertConcave("gamma", new String[] {"shape", "rate"}, 1, Scale.LOG, new double[] {0.3, 1});
    assertConcave("exponential", new String[] {"rate"}, 0, Scale.NATURAL, new double[] {1});
    assertConcave("logistic", new String[] {"location", "scale"}, 0, Scale.NATURAL, new double[] {0, 1});
    Parametrisation gamma = Censored.of(FamilyCases.parametrisation("gamma", "shape", "rate")).orElseThrow();
    Curvature lowShape = gamma.curvatureInArgument(1, Scale.NATURAL, new double[] {0.5, Double.NaN, 3});
    assertFalse(lowShape.concave(), lowShape.reason());
    assertTrue(lowShape.reason().contains("shape >= 1"), lowShape.reason());
    Curvature sd = Censored.of(FamilyCases.parametrisation("normal", "mean", "sd")).orElseThrow()
        .curvatureInArgument(1, Scale.NATURAL, new double[] {0, Double.NaN, 3});
    assertEquals(false, sd.concave(), sd.reason());
  }

  private static void assertConcave(String family, String[] names, int k, Scale scale, double[] args) {
    Parametrisation censored = Censored.of(FamilyCases.parametrisation(family, names)).orElseThrow();
    double[] known = Arrays.copyOf(args, args.length + 1);
    known[k] = Double.NaN;
    known[args.length] = Double.POSITIVE_INFINITY;
    Curvature fact = censored.curvatureInArgument(k, scale, known);
    assertTrue(fact.concave(), family + " " + names[k] + " " + scale + ": " + fact.reason());
    assertTrue(fact.reason().contains("Prekopa"), fact.reason());
  }
}
