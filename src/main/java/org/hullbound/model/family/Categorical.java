package org.hullbound.model.family;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * The categorical family {@code categorical(p = w)}: a value in {@code 1 .. K} with probability
 * {@code w[k] / sum(w)}, where {@code w} is a vector of K non-negative weights (a vector of
 * probabilities adding to 1 is used as written; weights that do not add to 1 are normalised, so
 * that unknown weights, such as gamma variables, give the Dirichlet construction). The trade's
 * "categorical" or "discrete" distribution (Johnson, Kemp and Kotz, Univariate Discrete
 * Distributions, 3rd ed., 2005, ch. 11 on multinomial cells; common practice).
 *
 * <p>The model language writes one argument, the vector; the binder expands it into K arguments
 * {@code p[1] .. p[K]} by {@link #withCategories(int)}. The family's own parametrisation is the
 * one-category case, which only matching by name uses.
 */
public final class Categorical {
  private Categorical() {}

  static Family family() {
    return SimpleFamily.of("categorical", f -> List.of(new ByWeights(f, 1)));
  }

  /**
   * Whether {@code p} is the categorical's vector form, whose one argument the binder must expand
   * with {@link #withCategories}.
   */
  public static boolean takesVector(Parametrisation p) {
    return p instanceof ByWeights;
  }

  /** The categorical over {@code 1 .. categories}, with arguments {@code p[1] .. p[K]}. */
  public static Parametrisation withCategories(Parametrisation p, int categories) {
    if (!(p instanceof ByWeights weights)) {
      throw new IllegalArgumentException("p must be the categorical family, got " + p);
    }
    if (categories < 1) {
      throw new IllegalArgumentException("categories must be >= 1, got " + categories);
    }
    return new ByWeights(weights.family(), categories);
  }

  private static Object[] names(int categories) {
    List<Object> list = new ArrayList<>();
    for (int k = 1; k <= categories; k++) {
      list.add(categories == 1 ? "p" : "p[" + k + "]");
      list.add(ArgumentDomain.NON_NEGATIVE);
    }
    return list.toArray();
  }

  private static final class ByWeights extends BaseParametrisation {
    ByWeights(Family family, int categories) {
      super(family, SupportKind.CATEGORY, names(categories));
    }

    /**
     * Equal to the categorical of the same family over as many categories: the binder makes one a
     * term, and a compiled form shared by many terms ({@code model.AllocationRows}) tells them
     * alike by this.
     */
    @Override
    public boolean equals(Object other) {
      return other instanceof ByWeights w && w.family() == family() && w.arity() == arity();
    }

    @Override
    public int hashCode() {
      return 31 * System.identityHashCode(family()) + arity();
    }

    @Override
    String checkJointly(double[] args) {
      double sum = sum(args);
      return sum > 0 && sum < Double.POSITIVE_INFINITY
          ? null : "the weights p must have a positive, finite sum, got " + format(sum);
    }

    private static double sum(double[] args) {
      double sum = 0;
      for (double w : args) {
        sum += w;
      }
      return sum;
    }

    @Override
    double evaluate(double x, double[] args, double[] gradient) {
      int j = (int) x - 1;
      double sum = sum(args);
      if (gradient != null) {
        gradient[0] = 0.0;
        for (int i = 0; i < args.length; i++) {
          gradient[1 + i] = (i == j ? 1 / args[j] : 0) - 1 / sum;
        }
      }
      return Math.log(args[j]) - Math.log(sum);
    }

    @Override
    public double logProbabilityBetween(
        double lo, double hi, double[] args, double[] gradientOfArgs) {
      requireOrdered(lo, hi);
      double first = Math.max(Math.ceil(lo), 1);
      double last = Math.min(Math.floor(hi), args.length);
      double inside = 0;
      for (int k = (int) first; k <= last; k++) {
        inside += args[k - 1];
      }
      double sum = sum(args);
      for (int i = 0; i < args.length; i++) {
        boolean in = i + 1 >= first && i + 1 <= last;
        gradientOfArgs[i] = inside > 0 ? (in ? 1 / inside : 0) - 1 / sum : 0;
      }
      return inside > 0 ? Math.log(inside) - Math.log(sum) : Double.NEGATIVE_INFINITY;
    }

    @Override
    public Curvature curvatureInValue(Scale scale, double[] knownArgs) {
      return Curvature.notEstablished(
          "a categorical value is a category: concavity in a continuous value does not apply");
    }

    @Override
    public Curvature curvatureInArgument(int k, Scale scale, double[] knownArgs) {
      return switch (scale) {
        // log w_j - log(w_k + r): in w_k, +1/(w_k + r)^2 > 0 when k != j.
        case NATURAL -> Curvature.notEstablished(
            "categorical log mass -log(sum of p) is convex in a weight of another category:"
                + " second derivative 1/sum^2 > 0");
        // u = log w_k: u - log(e^u + r) and -log(e^u + r) both have second derivative
        // -r e^u / (e^u + r)^2 <= 0.
        case LOG -> Curvature.concave(
            "categorical log mass is concave in u = log(weight): u - log(e^u + r) or -log(e^u + r),"
                + " second derivative -r e^u/(e^u + r)^2 <= 0");
        case LOGIT -> Reasons.notAnalysed(this, argumentNames().get(k), scale);
      };
    }

    @Override
    public String toString() {
      return "categorical(p) over " + arity() + " categor" + (arity() == 1 ? "y" : "ies")
          + " " + Arrays.toString(argumentNames().toArray());
    }
  }
}
