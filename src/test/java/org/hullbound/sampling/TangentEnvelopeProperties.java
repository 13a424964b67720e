package org.hullbound.sampling;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.function.DoubleUnaryOperator;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.Combinators;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;

/**
 * The cheap path's envelope and squeeze bound the log-density from above and from below
 * everywhere, as the general hull's do ({@code hull.UpperHullProperties}): u(x) &gt;= h(x) &gt;=
 * l(x) for generated log-concave densities (normal, gamma with shape at least 1, logistic) and
 * generated abscissae, at points inside, between and beyond the abscissae (Gilks and Wild 1992,
 * section 2.2: the tangents of a concave h lie above it, its chords below). A squeeze above h
 * would accept draws without evaluating h where the envelope's law differs from the density's,
 * which no rejection test could then correct.
 */
class TangentEnvelopeProperties {

  /** Rounding allowance in log-density units, relative to the magnitudes compared. */
  private static final double ROUNDING = 1e-9;

  /** A concave log-density with its slope, its support and a typical scale around its mode. */
  record Target(String name, DoubleUnaryOperator h, DoubleUnaryOperator slope, double lower,
      double upper, double mode, double scale) {
    @Override
    public String toString() {
      return name;
    }
  }

  @Provide
  Arbitrary<Target> targets() {
    return Arbitraries.oneOf(
        Combinators.combine(
                Arbitraries.doubles().between(-1e4, 1e4), Arbitraries.doubles().between(1e-3, 1e3).ofScale(4))
            .as((mean, sd) -> new Target("normal(" + mean + ", " + sd + ")",
                x -> -(x - mean) * (x - mean) / (2 * sd * sd), x -> -(x - mean) / (sd * sd),
                Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY, mean, sd)),
        Combinators.combine(
                Arbitraries.doubles().between(1.05, 50), Arbitraries.doubles().between(0.01, 100))
            .as((shape, rate) -> new Target("gamma(" + shape + ", " + rate + ")",
                x -> (shape - 1) * Math.log(x) - rate * x, x -> (shape - 1) / x - rate, 0,
                Double.POSITIVE_INFINITY, (shape - 1) / rate, Math.sqrt(shape) / rate)),
        Arbitraries.doubles().between(-50, 50)
            .map(location -> new Target("logistic(" + location + ")",
                x -> -(x - location) - 2 * Math.log1p(Math.exp(-(x - location))),
                x -> -1 + 2 / (1 + Math.exp(x - location)),
                Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY, location, 1)));
  }

  @Provide
  Arbitrary<List<Double>> offsets() {
    return Arbitraries.doubles().between(-4, 4).list().ofMinSize(0).ofMaxSize(5);
  }

  @Property(tries = 400)
  void theEnvelopeLiesAboveAndTheSqueezeBelowTheLogDensityEverywhere(
      @ForAll("targets") Target target, @ForAll("offsets") List<Double> offsets,
      @ForAll("sides") double[] sides) {
    TangentEnvelopeDraw envelope = TangentEnvelopeDraw.create();
    // one abscissa on each side of the mode, so that both unbounded sides have a tail
    double left = target.mode() - sides[0] * target.scale();
    add(envelope, target, left > target.lower() ? left : (target.lower() + target.mode()) / 2);
    add(envelope, target, target.mode() + sides[1] * target.scale());
    for (double offset : offsets) {
      add(envelope, target, target.mode() + offset * target.scale());
    }
    int checked = 0;
    for (int i = -400; i <= 400; i++) {
      double x = target.mode() + i / 50.0 * target.scale();
      if (!(x > target.lower() && x < target.upper())) {
        continue;
      }
      double h = target.h().applyAsDouble(x);
      double u = envelopeAt(envelope, target.lower(), target.upper(), x);
      double l = envelope.squeeze(x);
      assertFalse(Double.isNaN(u), target + ": no envelope from " + offsets);
      double allowance = ROUNDING * (1 + Math.abs(h) + Math.abs(u));
      assertTrue(u >= h - allowance, target + " at " + x + ": envelope " + u + " below h " + h);
      if (l > Double.NEGATIVE_INFINITY) {
        assertTrue(l <= h + ROUNDING * (1 + Math.abs(h) + Math.abs(l)),
            target + " at " + x + ": squeeze " + l + " above h " + h);
        checked++;
      }
    }
    assertTrue(checked > 0, target + ": the squeeze was compared somewhere");
  }

  @Provide
  Arbitrary<double[]> sides() {
    return Combinators.combine(
            Arbitraries.doubles().between(0.05, 3), Arbitraries.doubles().between(0.05, 3))
        .as((left, right) -> new double[] {left, right});
  }

  /**
   * The envelope the draw samples from, at {@code x}: the tangent of the piece of {@link
   * TangentEnvelopeDraw#build} that holds x (pieces end where neighbouring tangents meet), or NaN
   * where the abscissae make no valid envelope.
   */
  private static double envelopeAt(TangentEnvelopeDraw envelope, double lower, double upper,
      double x) {
    if (Double.isNaN(envelope.build(lower, upper))) {
      return Double.NaN;
    }
    int last = envelope.abscissae().length - 1;
    int j = 0;
    while (j < last && x > envelope.ends[j + 1]) {
      j++;
    }
    return envelope.tangent(j, x);
  }

  private static void add(TangentEnvelopeDraw envelope, Target target, double x) {
    if (x > target.lower() && x < target.upper()) {
      envelope.add(x, target.h().applyAsDouble(x), target.slope().applyAsDouble(x));
    }
  }
}
