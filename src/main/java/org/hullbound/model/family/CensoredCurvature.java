package org.hullbound.model.family;

/**
 * When the log-probability of a censoring interval, {@code log P(a < X <= b)} (right, left and
 * interval censoring alike), is concave in one argument of the family, with the proof in words for
 * {@code check}'s reason.
 *
 * <p>Two rules, both from Prekopa's theorem (A. Prekopa 1973, "On logarithmic concave measures
 * and functions", Acta Sci. Math. 34, 335-343: a log-concave function of {@code (theta, w)}
 * integrated over {@code w} is log-concave in {@code theta}); for the one-sided cases they are
 * the log-concavity of the distribution and survival functions of a log-concave density (M.
 * Bagnoli and T. Bergstrom 2005, "Log-concave probability and its applications", Economic
 * Theory 26, 445-469, Theorems 1 and 3).
 *
 * <ol>
 *   <li><b>Location.</b> If {@code T(X) = theta + W} for an increasing map {@code T} (the identity
 *       or the log) and {@code W} has a log-concave density free of {@code theta}, then {@code
 *       P(a < X <= b) = integral of 1[T(a) - theta < w <= T(b) - theta] f(w) dw}; the indicator
 *       of that set is log-concave in {@code (theta, w)} (the set is convex: two half-planes), so
 *       the integral is log-concave in {@code theta}. This covers the normal mean, logistic and
 *       laplace location and lognormal meanlog (identity, on the natural scale), and on the log
 *       scale the weibull scale ({@code log X = log scale + log(E)/shape}, {@code E} standard
 *       exponential, {@code log E} with log-density {@code s - exp(s)}), the gamma rate and scale
 *       and the exponential rate ({@code log X = log G -+ log rate}, {@code log G} with
 *       log-density {@code shape s - exp(s)}, concave for every shape), and the inverse-gamma scale
 *       ({@code log X = log scale - log G}), the half-normal sd and the half-cauchy scale
 *       ({@code log X = log scale + log|Z|}, {@code log|Z|} with log-density {@code s -
 *       exp(2s)/2}, respectively {@code s - log(1 + exp(2s))}, both concave).
 *   <li><b>Rate.</b> If {@code X = W / theta} with {@code W} of log-concave density, then {@code
 *       P(a < X <= b) = P(theta a < W <= theta b)}, whose set is again convex in {@code (theta,
 *       w)}: log-concave in {@code theta} on the natural scale. This covers the exponential rate
 *       and, when shape >= 1 (the gamma density is log-concave exactly then), the gamma rate; and
 *       the weibull shape, as {@code P(shape A < log E <= shape B)} with {@code A = log(a/scale)},
 *       {@code B = log(b/scale)}.
 * </ol>
 *
 * <p>Everything else is "not established" and the unknown gets the fallback sampler; {@code
 * CensoredCurvatureProperties} checks each rule by second differences at random points and shows,
 * for the cases left out, points where concavity fails.
 */
final class CensoredCurvature {
  private CensoredCurvature() {}

  static Curvature inArgument(
      ContinuousParametrisation observed, int k, Scale scale, double[] knownArgs) {
    String family = observed.family().name();
    String argument = observed.argumentNames().get(k);
    String rule = switch (family + " " + argument + " " + scale) {
      case "normal mean NATURAL", "logistic location NATURAL", "laplace location NATURAL" ->
          location(family + " " + argument, "X = " + argument + " + W", "W " + family);
      case "lognormal meanlog NATURAL" ->
          location("lognormal meanlog", "log X = meanlog + W", "W normal");
      case "weibull scale LOG" ->
          location("weibull log(scale)", "log X = log(scale) + log(E)/shape",
              "the log of a standard exponential E (log-density s - exp(s))");
      case "gamma scale LOG", "gamma rate LOG" ->
          location("gamma log(" + argument + ")",
              "log X = log(G) " + (argument.equals("rate") ? "- log(rate)" : "+ log(scale)"),
              "the log of a standard gamma G (log-density shape s - exp(s), concave for every"
                  + " shape)");
      case "exponential rate LOG" ->
          location("exponential log(rate)", "log X = log(E) - log(rate)",
              "the log of a standard exponential E (log-density s - exp(s))");
      case "inverse-gamma scale LOG" ->
          location("inverse-gamma log(scale)", "log X = log(scale) - log(G)",
              "minus the log of a standard gamma G (log-density -shape s - exp(-s))");
      case "half-normal sd LOG" ->
          location("half-normal log(sd)", "log X = log(sd) + log|Z|",
              "the log of |Z|, Z standard normal (log-density s - exp(2 s)/2)");
      case "half-cauchy scale LOG" ->
          location("half-cauchy log(scale)", "log X = log(scale) + log|C|",
              "the log of |C|, C standard cauchy (log-density s - log(1 + exp(2 s)))");
      case "exponential rate NATURAL" ->
          rate("exponential rate", "P(rate a < E <= rate b)", "E standard exponential");
      case "gamma rate NATURAL" -> BaseParametrisation.known(knownArgs, 0) && knownArgs[0] >= 1
          ? rate("gamma rate", "P(rate a < G <= rate b)",
              "G standard gamma, log-concave since shape >= 1")
          : null;
      case "weibull shape NATURAL" ->
          rate("weibull shape", "P(shape log(a/scale) < log E <= shape log(b/scale))",
              "E standard exponential, log E with log-density s - exp(s)");
      default -> null;
    };
    if (rule != null) {
      return Curvature.concave(rule);
    }
    String where = scale == Scale.NATURAL ? argument : scale == Scale.LOG ? "log(" + argument + ")"
        : "logit(" + argument + ")";
    String why = family.equals("gamma") && argument.equals("rate") && scale == Scale.NATURAL
        ? " (it is when shape >= 1 is known; shape is " + (BaseParametrisation.known(knownArgs, 0)
            ? BaseParametrisation.format(knownArgs[0]) : "unknown") + ")"
        : "";
    return Curvature.notEstablished(
        "no rule shows a censored " + family + " term log-concave in " + where + why);
  }

  private static String location(String what, String form, String density) {
    return "a censored term log P(a < X <= b) is log-concave in " + what + ": " + form
        + " moves a variable of log-concave density (" + density + ") by a location shift"
        + " (Prekopa 1973; Bagnoli and Bergstrom 2005)";
  }

  private static String rate(String what, String form, String density) {
    return "a censored term is log-concave in " + what + ": it is " + form + " with " + density
        + ", an integral of a log-concave density over a set convex in (" + what.split(" ")[1]
        + ", w) (Prekopa 1973)";
  }
}
