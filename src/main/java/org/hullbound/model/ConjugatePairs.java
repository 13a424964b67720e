package org.hullbound.model;

import java.util.ArrayList;
import java.util.List;

/**
 * Recognises conjugate prior-likelihood pairs in an unknown's Markov blanket and builds the rule
 * that computes the exact posterior from the current state.
 *
 * <p>The closed forms are those of Gelman et al., Bayesian Data Analysis, 3rd ed. (2013): normal
 * mean with known variance (section 2.5), Poisson rate with a gamma prior (section 2.6, extended
 * to exposures, exponential and gamma children), normal precision with a gamma prior and normal
 * variance with an inverse-gamma prior (section 2.6 and 3.2, in precision and variance form),
 * binomial probability with a beta prior (section 2.4). To add a pair: add a kind to {@link
 * Update.ConjugateKind}, a detector here that checks every dependent term's form, and a test
 * against the textbook closed form in {@code ConjugatePairsTest}.
 */
final class ConjugatePairs {

  private ConjugatePairs() {}

  /** The conjugate update of slot {@code s}, or {@code null} when no pair is recognised. */
  static Update.Conjugate detect(int s, Term own, List<Term> dependents, boolean imputed) {
    if (own.truncated()) {
      return null;
    }
    TermTable.Rows rows = dependents instanceof TermTable.Rows r ? r : null;
    for (int i = 0; i < dependents.size(); i++) {
      // a statement says whether its rows are truncated without a row's term being made
      StatementFormula statement = rows == null ? null : rows.statement(i);
      if (statement != null ? statement.truncated() : dependents.get(i).truncated()) {
        return null;
      }
    }
    if (imputed) {
      return dependents.isEmpty() ? predictive(s, own) : null;
    }
    switch (own.familyName()) {
      case "normal":
        return normalMean(s, own, dependents);
      case "gamma":
      case "exponential":
        return gammaRate(s, own, dependents);
      case "inverse-gamma":
        return inverseGammaVariance(s, own, dependents);
      case "beta":
        return betaProbability(s, own, dependents);
      default:
        return null;
    }
  }

  /** Evaluates a compiled formula that does not read the own unknown, or reads it at x. */
  private static double at(Evaluator e, double x, double[] state) {
    return e.eval(new Frame(x, state));
  }

  private static Evaluator compile(Formula f, int s) {
    return Evaluator.compile(f, s);
  }

  /** Only the argument called {@code name} reads slot s. */
  private static boolean onlyIn(Term t, String name, int s) {
    for (int k = 0; k < t.arguments().size(); k++) {
      boolean reads = t.arguments().get(k).reads(s);
      if (reads != t.argumentName(k).equals(name)) {
        return false;
      }
    }
    return !t.value().reads(s);
  }

  /** The precision of a normal term from whichever of sd, var, precision it has. */
  private record Spread(String name, Evaluator value) {
    static Spread of(Term t, int s) {
      for (String name : List.of("sd", "var", "precision")) {
        Formula f = t.argument(name);
        if (f != null) {
          return new Spread(name, compile(f, s));
        }
      }
      throw new IllegalStateException("a normal term without a spread argument");
    }

    double precision(double[] state) {
      double v = at(value, 0, state);
      switch (name) {
        case "sd":
          return 1 / (v * v);
        case "var":
          return 1 / v;
        default:
          return v;
      }
    }

    /** The standard deviation, without squaring, so that it is exact where sd^2 would overflow. */
    double sd(double[] state) {
      double v = at(value, 0, state);
      switch (name) {
        case "sd":
          return v;
        case "var":
          return Math.sqrt(v);
        default:
          return 1 / Math.sqrt(v);
      }
    }
  }

  private record NormalChild(Evaluator value, Evaluator mean, Spread spread) {}

  // Gelman et al. BDA3 section 2.5: with y_i ~ N(a_i + b_i theta, 1/p_i) and theta ~ N(m0, 1/p0),
  // theta | y ~ N((p0 m0 + sum p_i b_i (y_i - a_i)) / P, 1/P) with P = p0 + sum p_i b_i^2.
  private static Update.Conjugate normalMean(int s, Term own, List<Term> dependents) {
    List<NormalChild> children = new ArrayList<>();
    for (Term t : dependents) {
      if (!t.familyName().equals("normal")
          || !onlyIn(t, "mean", s)
          || !Formulas.affine(t.argument("mean"), s)) {
        return null;
      }
      children.add(
          new NormalChild(compile(t.value(), s), compile(t.argument("mean"), s), Spread.of(t, s)));
    }
    Evaluator priorMean = compile(own.argument("mean"), s);
    Spread priorSpread = Spread.of(own, s);
    Update.PosteriorRule rule =
        state -> {
          double priorPrecision = priorSpread.precision(state);
          double mean = at(priorMean, 0, state);
          // A prior precision that underflows to 0 (sd above about 1e154) is below rounding
          // beside any data's, so the data alone decide, as they should.
          double precision = priorPrecision;
          double weighted = priorPrecision * mean;
          double fromData = 0;
          Frame frame = new Frame(0, state);
          for (NormalChild child : children) {
            double y = child.value().eval(frame);
            double a = child.mean().eval(frame);
            double b = frame.slope;
            double p = child.spread().precision(state);
            precision += p * b * b;
            fromData += p * b * b;
            weighted += p * b * (y - a);
          }
          // Where the data carry no information, or the prior's precision overflows (sd below
          // about 1e-154), the posterior is the prior: read its sd directly, since 1 / sd^2 may
          // be 0 or infinite although sd is representable.
          if (fromData == 0 || priorPrecision == Double.POSITIVE_INFINITY) {
            return new Posterior(
                "normal", List.of("mean", "sd"), new double[] {mean, priorSpread.sd(state)});
          }
          return new Posterior(
              "normal", List.of("mean", "sd"),
              new double[] {weighted / precision, 1 / Math.sqrt(precision)});
        };
    return new Update.Conjugate(
        Update.ConjugateKind.NORMAL_MEAN,
        "exact draw: normal prior, and every dependent term is normal with a mean affine in the"
            + " unknown and a spread free of it",
        rule);
  }

  private enum RateChild {
    POISSON,
    EXPONENTIAL,
    GAMMA,
    NORMAL_PRECISION
  }

  private record GammaChild(RateChild kind, Evaluator value, Evaluator multiple, Evaluator other) {}

  // BDA3 section 2.6: gamma(alpha, beta) prior; a Poisson count y with rate c theta adds (y, c);
  // an exponential waiting time y with rate c theta adds (1, c y); a gamma(shape k) value y with
  // rate c theta adds (k, c y); a normal y with precision c theta adds (1/2, c (y - m)^2 / 2).
  private static Update.Conjugate gammaRate(int s, Term own, List<Term> dependents) {
    List<GammaChild> children = new ArrayList<>();
    boolean allNormal = !dependents.isEmpty();
    for (Term t : dependents) {
      RateChild kind;
      String argument;
      Formula other = null;
      switch (t.familyName()) {
        case "poisson":
          kind = RateChild.POISSON;
          argument = "rate";
          break;
        case "exponential":
          kind = RateChild.EXPONENTIAL;
          argument = "rate";
          break;
        case "gamma":
          kind = RateChild.GAMMA;
          argument = "rate";
          other = t.argument("shape");
          break;
        case "normal":
          kind = RateChild.NORMAL_PRECISION;
          argument = "precision";
          other = t.argument("mean");
          break;
        default:
          return null;
      }
      Formula f = t.argument(argument);
      if (f == null || !onlyIn(t, argument, s) || !Formulas.linear(f, s)) {
        return null;
      }
      allNormal &= kind == RateChild.NORMAL_PRECISION;
      children.add(
          new GammaChild(
              kind, compile(t.value(), s), compile(f, s), other == null ? null : compile(other, s)));
    }
    boolean exponentialPrior = own.familyName().equals("exponential");
    Evaluator shape = exponentialPrior ? null : compile(own.argument("shape"), s);
    Formula rateFormula = own.argument("rate");
    Evaluator rate = rateFormula != null ? compile(rateFormula, s) : null;
    Evaluator scale = rateFormula == null ? compile(own.argument("scale"), s) : null;
    Update.PosteriorRule rule =
        state -> {
          double alpha = exponentialPrior ? 1 : at(shape, 0, state);
          double beta = rate != null ? at(rate, 0, state) : 1 / at(scale, 0, state);
          for (GammaChild child : children) {
            double y = at(child.value(), 0, state);
            double c = at(child.multiple(), 1, state);
            switch (child.kind()) {
              case POISSON:
                alpha += y;
                beta += c;
                break;
              case EXPONENTIAL:
                alpha += 1;
                beta += c * y;
                break;
              case GAMMA:
                alpha += at(child.other(), 0, state);
                beta += c * y;
                break;
              default:
                double r = y - at(child.other(), 0, state);
                alpha += 0.5;
                beta += c * r * r / 2;
            }
          }
          return new Posterior("gamma", List.of("shape", "rate"), new double[] {alpha, beta});
        };
    return new Update.Conjugate(
        allNormal ? Update.ConjugateKind.GAMMA_PRECISION : Update.ConjugateKind.GAMMA_RATE,
        allNormal
            ? "exact draw: gamma prior, and every dependent term is normal with a precision"
                + " proportional to the unknown"
            : "exact draw: gamma prior, and every dependent term is poisson, exponential, gamma"
                + " or normal with a rate (precision) proportional to the unknown",
        rule);
  }

  private record VarianceChild(Evaluator value, Evaluator mean, Evaluator multiple) {}

  // BDA3 section 2.6 (variance form): inverse-gamma(alpha, beta) prior; a normal y with variance
  // c theta adds (1/2, (y - m)^2 / (2 c)).
  private static Update.Conjugate inverseGammaVariance(int s, Term own, List<Term> dependents) {
    List<VarianceChild> children = new ArrayList<>();
    for (Term t : dependents) {
      Formula variance = t.argument("var");
      if (!t.familyName().equals("normal")
          || variance == null
          || !onlyIn(t, "var", s)
          || !Formulas.linear(variance, s)) {
        return null;
      }
      children.add(
          new VarianceChild(
              compile(t.value(), s), compile(t.argument("mean"), s), compile(variance, s)));
    }
    Evaluator shape = compile(own.argument("shape"), s);
    Evaluator scale = compile(own.argument("scale"), s);
    Update.PosteriorRule rule =
        state -> {
          double alpha = at(shape, 0, state);
          double beta = at(scale, 0, state);
          for (VarianceChild child : children) {
            double r = at(child.value(), 0, state) - at(child.mean(), 0, state);
            alpha += 0.5;
            beta += r * r / (2 * at(child.multiple(), 1, state));
          }
          return new Posterior("inverse-gamma", List.of("shape", "scale"), new double[] {alpha, beta});
        };
    return new Update.Conjugate(
        Update.ConjugateKind.INV_GAMMA_VARIANCE,
        "exact draw: inverse-gamma prior, and every dependent term is normal with a variance"
            + " proportional to the unknown",
        rule);
  }

  private record BinomialChild(Evaluator value, Evaluator trials) {}

  // BDA3 section 2.4: beta(a, b) prior; y successes of n trials with probability theta add
  // (y, n - y); a Bernoulli y is one trial.
  private static Update.Conjugate betaProbability(int s, Term own, List<Term> dependents) {
    List<BinomialChild> children = new ArrayList<>();
    for (Term t : dependents) {
      Formula p = t.argument("p");
      boolean binomial = t.familyName().equals("binomial");
      if (!(binomial || t.familyName().equals("bernoulli"))
          || !(p instanceof Formula.Slot slot && slot.index() == s)
          || !onlyIn(t, "p", s)) {
        return null;
      }
      children.add(
          new BinomialChild(
              compile(t.value(), s), binomial ? compile(t.argument("trials"), s) : null));
    }
    Evaluator a0 = compile(own.argument("a"), s);
    Evaluator b0 = compile(own.argument("b"), s);
    Update.PosteriorRule rule =
        state -> {
          double a = at(a0, 0, state);
          double b = at(b0, 0, state);
          for (BinomialChild child : children) {
            double y = at(child.value(), 0, state);
            double n = child.trials() == null ? 1 : at(child.trials(), 0, state);
            a += y;
            b += n - y;
          }
          return new Posterior("beta", List.of("a", "b"), new double[] {a, b});
        };
    return new Update.Conjugate(
        Update.ConjugateKind.BETA_PROBABILITY,
        "exact draw: beta prior, and every dependent term is binomial or bernoulli with p the"
            + " unknown",
        rule);
  }

  private static Update.Conjugate predictive(int s, Term own) {
    List<Evaluator> args = new ArrayList<>();
    for (Formula f : own.arguments()) {
      args.add(compile(f, s));
    }
    List<String> names = own.family().argumentNames();
    String family = own.familyName();
    Update.PosteriorRule rule =
        state -> {
          double[] values = new double[args.size()];
          for (int k = 0; k < values.length; k++) {
            values[k] = at(args.get(k), 0, state);
          }
          return new Posterior(family, names, values);
        };
    return new Update.Conjugate(
        Update.ConjugateKind.PREDICTIVE,
        "exact draw: a missing observation that nothing depends on is drawn from its own family",
        rule);
  }
}
