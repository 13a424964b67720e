package org.hullbound.model.family;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.ConcurrentHashMap;

/**
 * The likelihood of a censored observation: a value known only to lie between two limits, whose
 * term is the log of the probability of that interval, {@code log(F(upper) - F(lower))}.
 *
 * <p>Right censoring ({@code upper = inf}) gives {@code log S(lower)}, left censoring ({@code lower
 * = -inf}, or the lower end of the support) {@code log F(upper)}, and interval censoring the
 * difference; all three come from the family's own tails ({@code logProbabilityBetween}, the same
 * code as the truncation normaliser), which take whichever tail is small and subtract in log space
 * ({@link LogSpace#logProbabilityFromTails}), so a normal observation censored 40 sd above its
 * mean keeps full relative accuracy.
 *
 * <p>A censored term is written as a parametrisation of its own, so that everything that walks the
 * model's terms (compiled conditionals, the log-concavity and conjugacy analyses) handles it without
 * a special case: its "value" is the lower limit and its last argument, {@code upper_limit}, the
 * upper one; both are known numbers. Its family is called {@code censored <family>}, so that no
 * conjugate pair or linear-normal block, which match exact observations by family name, takes it.
 * Its curvature in the family's arguments is {@link CensoredCurvature}'s.
 *
 * <p>Only continuous families have a distribution function here: {@link #of} is empty for a
 * discrete one.
 */
public final class Censored {
  /** The name of the argument that holds the upper limit. */
  public static final String UPPER_LIMIT = "upper_limit";

  private static final Map<Parametrisation, Parametrisation> MADE = new ConcurrentHashMap<>();

  private Censored() {}

  /**
   * The censored form of {@code observed}: one instance per parametrisation, so that a term per
   * row costs no object of its own; empty when {@code observed} is discrete.
   */
  public static Optional<Parametrisation> of(Parametrisation observed) {
    if (!(observed instanceof ContinuousParametrisation continuous)) {
      return Optional.empty();
    }
    return Optional.of(MADE.computeIfAbsent(continuous, p -> newInterval((ContinuousParametrisation) p)));
  }

  /** True when {@code p} is the censored form of a family ({@link #of}). */
  public static boolean isCensored(Parametrisation p) {
    return p instanceof Interval;
  }

  private static Parametrisation newInterval(ContinuousParametrisation observed) {
    Parametrisation[] made = new Parametrisation[1];
    SimpleFamily.of("censored " + observed.family().name(), f -> {
      made[0] = new Interval(f, observed);
      return List.of(made[0]);
    });
    return made[0];
  }

  /** {@code log P(lower < X <= upper)} with the value the lower limit and the upper one last. */
  private static final class Interval implements Parametrisation {
    private final Family family;
    private final ContinuousParametrisation observed;
    private final int arity;
    private final List<String> names;

    Interval(Family family, ContinuousParametrisation observed) {
      this.family = family;
      this.observed = observed;
      this.arity = observed.argumentNames().size();
      List<String> all = new ArrayList<>(observed.argumentNames());
      all.add(UPPER_LIMIT);
      this.names = List.copyOf(all);
    }

    @Override
    public Family family() {
      return family;
    }

    @Override
    public List<String> argumentNames() {
      return names;
    }

    @Override
    public SupportKind support() {
      return observed.support();
    }

    @Override
    public double logDensity(double x, double[] args) {
      return logDensity(x, args, new double[1 + names.size()]);
    }

    @Override
    public double logDensity(double x, double[] args, double[] gradient) {
      double upper = args[arity];
      if (Double.isNaN(x) || Double.isNaN(upper)) {
        java.util.Arrays.fill(gradient, 0, 1 + names.size(), Double.NaN);
        return Double.NaN;
      }
      if (!(x < upper)) {
        java.util.Arrays.fill(gradient, 0, 1 + names.size(), 0.0);
        return Double.NEGATIVE_INFINITY;
      }
      double logP = observed.logProbabilityBetween(x, upper, args, gradient, 1);
      if (logP == Double.NEGATIVE_INFINITY) {
        gradient[0] = 0;
        gradient[1 + arity] = 0;
        return logP;
      }
      // d/dlower log P = -f(lower)/P, d/dupper = f(upper)/P; zero where the limit is outside the
      // support, where f is 0.
      gradient[0] = -Math.exp(observed.logDensity(x, args) - logP);
      gradient[1 + arity] = Math.exp(observed.logDensity(upper, args) - logP);
      return logP;
    }

    @Override
    public ArgumentRange argumentRange(int k) {
      return k < arity ? observed.argumentRange(k)
          : new ArgumentRange(Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY, false);
    }

    @Override
    public String checkArguments(double[] args) {
      if (args.length != names.size()) {
        return signature() + " takes " + names.size() + " arguments, got " + args.length;
      }
      String problem = checkArgument(arity, args[arity]);
      return problem != null ? problem : observed.checkArguments(java.util.Arrays.copyOf(args, arity));
    }

    @Override
    public String checkArgument(int k, double value) {
      if (k < arity) {
        return observed.checkArgument(k, value);
      }
      return Double.isNaN(value) ? UPPER_LIMIT + " must be a number, got NaN" : null;
    }

    @Override
    public String checkValue(double x, double[] args) {
      return x < args[arity] ? null
          : "the lower limit " + BaseParametrisation.format(x) + " must be below the upper limit "
              + BaseParametrisation.format(args[arity]);
    }

    @Override
    public double logProbabilityBetween(
        double lo, double hi, double[] args, double[] gradientOfArgs) {
      double logP = observed.logProbabilityBetween(lo, hi, args, gradientOfArgs);
      gradientOfArgs[arity] = 0;
      return logP;
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return Curvature.notEstablished(
          family.name() + ": the limits of a censored observation are known numbers, never"
              + " sampled");
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      if (k >= arity) {
        return Curvature.notEstablished(family.name() + ": the upper limit is a known number");
      }
      return CensoredCurvature.inArgument(observed, k, scale, knownArgs);
    }

    @Override
    public String toString() {
      return signature();
    }
  }
}
