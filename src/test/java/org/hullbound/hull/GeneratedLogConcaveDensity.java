package org.hullbound.hull;

import java.util.List;
import java.util.stream.Collectors;

/**
 * A log-concave density made of concave terms, for property tests: a main term that makes it
 * proper on its support (a concave quadratic on the line, a gamma-like term on a half-line, a
 * beta-like term on an interval) plus concave terms valid everywhere (quadratics, negative
 * exponentials, log-sigmoids). A sum of concave functions is concave (common practice).
 */
record GeneratedLogConcaveDensity(Support support, List<Term> terms)
    implements DifferentiableLogDensity {

  enum Kind {
    /** -a (x - b)^2. */
    QUADRATIC,
    /** -a exp(b x). */
    NEGATIVE_EXPONENTIAL,
    /** log sigmoid(a (x - b)) = -log(1 + exp(-a (x - b))). */
    LOG_SIGMOID,
    /** (a - 1) log(x - lower) - b (x - lower), a &gt;= 1, b &gt; 0: gamma-like on [lower, inf). */
    GAMMA_LIKE,
    /** (a - 1) log(x - lower) + (b - 1) log(upper - x), a, b &gt;= 1: beta-like on [lower, upper]. */
    BETA_LIKE
  }

  record Term(Kind kind, double a, double b) {}

  @Override
  public Evaluation evaluate(double x) {
    double value = 0;
    double slope = 0;
    for (Term t : terms) {
      double a = t.a();
      double b = t.b();
      switch (t.kind()) {
        case QUADRATIC -> {
          value += -a * (x - b) * (x - b);
          slope += -2 * a * (x - b);
        }
        case NEGATIVE_EXPONENTIAL -> {
          double e = Math.exp(b * x);
          value += -a * e;
          slope += -a * b * e;
        }
        case LOG_SIGMOID -> {
          double u = a * (x - b);
          value += u > 0 ? -Math.log1p(Math.exp(-u)) : u - Math.log1p(Math.exp(u));
          slope += a / (1 + Math.exp(u));
        }
        case GAMMA_LIKE -> {
          double y = x - support.lower();
          value += (a - 1) * Math.log(y) - b * y;
          slope += (a - 1) / y - b;
        }
        case BETA_LIKE -> {
          double y = x - support.lower();
          double z = support.upper() - x;
          value += (a - 1) * Math.log(y) + (b - 1) * Math.log(z);
          slope += (a - 1) / y - (b - 1) / z;
        }
      }
    }
    return new Evaluation(value, slope);
  }

  double value(double x) {
    return evaluate(x).value();
  }

  /** Maps a fraction in (0, 1) to a point of a typical region of the support. */
  double pointAt(double fraction) {
    if (support.isBoundedBelow() && support.isBoundedAbove()) {
      return support.lower() + fraction * (support.upper() - support.lower());
    }
    if (support.isBoundedBelow()) {
      return support.lower() + 15 * fraction;
    }
    return -10 + 20 * fraction;
  }

  @Override
  public String toString() {
    return "h on " + support + " = "
        + terms.stream()
            .map(t -> t.kind() + "(" + t.a() + ", " + t.b() + ")")
            .collect(Collectors.joining(" + "));
  }
}
