package org.hullbound.model.family;

import java.util.List;

/**
 * One parametrisation of a family (e.g. normal with mean and precision): its log-density with
 * gradient, argument and value checks, the truncation normaliser and curvature facts.
 *
 * <p>This is everything the compiler of full conditionals needs to know about one {@code ~} line;
 * arguments are passed as a {@code double[]} in the order of {@link #argumentNames()} so that the
 * compiled code allocates nothing per evaluation.
 *
 * <p>Arguments are assumed valid ({@link #checkArguments(double[])} returns {@code null}); with
 * invalid arguments the results are unspecified (usually NaN). Whole-number arguments (binomial
 * {@code trials}) and the value of a discrete family get gradient component 0: they are never
 * differentiated.
 */
public interface Parametrisation {
  /** The family this parametrisation belongs to. */
  Family family();

  /** The argument names; their order defines the indexes of {@code args[]}. */
  List<String> argumentNames();

  /** The support of the value. */
  SupportKind support();

  /** Whether values are whole numbers (a log mass rather than a log density). */
  default boolean discrete() {
    return support().discrete();
  }

  /** {@code family(arg1, arg2, ...)}, for messages. */
  default String signature() {
    return family().name() + "(" + String.join(", ", argumentNames()) + ")";
  }

  /**
   * The full log density (or log mass) including normalising constants, as commons-math3's {@code
   * logDensity}/{@code logProbability} would give; {@code -inf} outside the support.
   */
  double logDensity(double x, double[] args);

  /**
   * The same value, and fills {@code gradient[0] = d/dx} (0 for discrete families) and {@code
   * gradient[1 + k] = d/d args[k]}; {@code gradient.length} must be at least {@code 1 +
   * args.length}. Outside the support the value is {@code -inf} and the gradient is 0.
   */
  double logDensity(double x, double[] args, double[] gradient);

  /**
   * {@code args[k]} times d/d args[k] of the log density: its slope in {@code log(args[k])}, which
   * the compiler needs for a scale on the log scale. {@code gradient} holds what {@link
   * #logDensity(double, double[], double[])} filled at the same point. The default multiplies, so
   * it overflows where the natural-scale derivative does (about {@code args[k] < 1e-103} for a
   * normal sd); families override it with a form that does not.
   */
  default double logArgumentSlope(double x, double[] args, int k, double[] gradient) {
    double g = gradient[1 + k];
    return g == 0 ? 0 : args[k] * g;
  }

  /**
   * A loop over runs of terms whose only moving part is argument {@code k}, affine in the unknown
   * ({@link AffineRows}), or {@code null} when this parametrisation has none (the conditional then
   * evaluates such terms one at a time, to the same bits).
   */
  default AffineRows affineRows(int k) {
    return null;
  }

  /**
   * The interval argument {@code k} must lie in: where an argument moves with an unknown (a
   * binomial {@code p = alpha + beta * dose}), the unknown's support is cut to where it stays
   * inside.
   */
  ArgumentRange argumentRange(int k);

  /**
   * {@code null} when the arguments are valid, else a message naming the argument, its value and
   * what is required, e.g. {@code "sd must be > 0, got -1.0"}.
   */
  String checkArguments(double[] args);

  /**
   * {@code null} when {@code value} lies in the domain of argument {@code k} alone (checks that
   * involve several arguments are left to {@link #checkArguments}), else a message such as {@code
   * "trials must be a whole number >= 0, got 22.5"}. Lets a known argument be checked while others
   * are still unknown.
   */
  String checkArgument(int k, double value);

  /**
   * {@code null} when {@code x} is a valid value for these (valid) arguments, else a message, e.g.
   * {@code "a count must be a whole number >= 0, got 2.5"}.
   */
  String checkValue(double x, double[] args);

  /**
   * The log of the probability of {@code [lo, hi]}: {@code log(F(hi) - F(lo))} for continuous
   * families ({@code lo} may be {@code -inf}, {@code hi} {@code +inf}), {@code log P(lo <= X <= hi)}
   * for discrete ones; fills {@code gradientOfArgs[k] = d/d args[k]}.
   *
   * <p>Computed in log space from whichever tail is small, so that it keeps its relative accuracy
   * where {@code 1 - F} underflows. Location and scale arguments, rates and probabilities have
   * closed-form derivatives; shape-like arguments (gamma and inverse-gamma shape, beta a and b,
   * student df, negative-binomial size) are differentiated numerically by Richardson extrapolation of
   * central differences with step {@code 1e-3} times the argument (see the family's Javadoc).
   *
   * @throws IllegalArgumentException if {@code lo > hi}, or {@code lo == hi} for a continuous family
   */
  double logProbabilityBetween(double lo, double hi, double[] args, double[] gradientOfArgs);

  /**
   * Whether the log-density, as a function of the value on {@code scale}, is concave for every
   * value of the unknown arguments. On {@link Scale#LOG} and {@link Scale#LOGIT} the Jacobian term
   * ({@code u}, respectively {@code log(v (1 - v))}) is included, since the value is then the
   * sampled unknown.
   *
   * @param knownArgs the arguments, with {@code NaN} for those that are unknown
   */
  Curvature curvatureInValue(Scale scale, double[] knownArgs);

  /**
   * Whether the log-density, as a function of {@code args[k]} on {@code scale}, is concave for every
   * fixed value in the support and every value of the other unknown arguments. No Jacobian is
   * included: the argument is an expression equal to {@code exp(u)} or {@code expit(u)}.
   *
   * @param knownArgs the arguments, with {@code NaN} for those that are unknown
   */
  Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs);

  /**
   * For a discrete family: whether the log mass, as a function of the whole value, has
   * non-increasing differences {@code h(x + 1) - h(x)} (it is discretely log-concave) for every
   * value of the unknown arguments, which makes a latent count's conditional drawable by the
   * integer hull ({@code hull.DiscreteAdaptiveRejection}).
   *
   * @param knownArgs the arguments, with {@code NaN} for those that are unknown
   */
  default Curvature curvatureInWholeValue(double[] knownArgs) {
    return Curvature.notEstablished(
        "no rule shows the " + family().name() + " log mass concave in a whole value");
  }

  /**
   * Whether the log mass, as a function of the whole-number argument {@code k} (binomial {@code
   * trials}), has non-increasing differences for every value in the support and of the other
   * unknown arguments.
   *
   * @param knownArgs the arguments, with {@code NaN} for those that are unknown
   */
  default Curvature curvatureInWholeArgument(int k, double[] knownArgs) {
    return Curvature.notEstablished(
        "no rule shows the " + family().name() + " log mass concave in its whole argument "
            + argumentNames().get(k));
  }
}
