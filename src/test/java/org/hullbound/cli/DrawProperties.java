package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.Duration;
import java.util.List;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.Combinators;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import net.jqwik.api.Tuple;
import net.jqwik.api.statistics.Statistics;
import net.jqwik.api.statistics.StatisticsReport;

/**
 * Fuzzing of {@code hullbound draw}: random expressions built from the language's tokens, with
 * random bounds, end in draws (exit 0), a sampling failure (exit 1) or a usage error (exit 2),
 * each with a plain message, quickly, and never with an escaping exception. Seeds are fixed.
 */
class DrawProperties {

  private static final List<String> TOKENS =
      List.of("x", "x", "x", "-", "+", "*", "/", "^", "(", ")", "2", "0.5", "1e308", "inf",
          "log(", "exp(", "log1p(", "sqrt(", "abs(", "lgamma(", "min(x,", "max(x,",
          "expit(", "log_expit(", "y", "x[1]", "sum(i:", ",", " ");

  @Provide
  Arbitrary<String> tokenSoup() {
    return Arbitraries.of(TOKENS).list().ofMinSize(1).ofMaxSize(12).map(t -> String.join("", t));
  }

  @Provide
  Arbitrary<String> bounds() {
    return Arbitraries.of("-inf", "inf", "0", "1", "-1", "1e-300", "1e300", "2.5", "abc", "NaN");
  }

  @Property(tries = 200, seed = "20261201")
  void anyTokenSoupEndsInDrawsAFailureOrAUsageError(
      @ForAll("tokenSoup") String expression,
      @ForAll("bounds") String lower,
      @ForAll("bounds") String upper) {
    check(expression, lower, upper);
  }

  /**
   * Well-formed expressions (functions, operators, constants and x nested up to three deep,
   * often inside a falling wrapper such as -(E)^2 so that some are log-concave) on ordered
   * supports: both draws and sampling failures occur, and draws always lie in the support.
   * (Usage errors come from the token soup above.)
   */
  @Property(tries = 300, seed = "20261201")
  @StatisticsReport(StatisticsReport.StatisticsReportMode.OFF)
  void wellFormedExpressionsEndInDrawsAFailureOrAMessage(
      @ForAll("wellFormed") String expression, @ForAll("supports") String[] support) {
    Statistics.label("exit status").collect(check(expression, support[0], support[1]));
    // Every outcome must be explored, or the property would test one path only.
    Statistics.label("exit status")
        .coverage(
            checker -> {
              checker.check(0).percentage(p -> p >= 5);
              checker.check(1).percentage(p -> p >= 5);
            });
  }

  private static int check(String expression, String lower, String upper) {
    CliRun run =
        assertTimeoutPreemptively(
            Duration.ofSeconds(10),
            () -> CliRun.of("draw", "--log-density", expression, "--lower", lower, "--upper",
                upper, "-n", "20", "--seed", "1"));
    assertTrue(run.exit() == 0 || run.exit() == 1 || run.exit() == 2, run.toString());
    if (run.exit() == 0) {
      assertTrue(run.out().startsWith("x\n"), run.toString());
      assertTrue(run.out().lines().count() == 21, run.toString());
      double a = DrawCommand.bound("--lower", lower);
      double b = DrawCommand.bound("--upper", upper);
      run.out().lines().skip(1).mapToDouble(Double::parseDouble).forEach(
          x -> assertTrue(a <= x && x <= b, "draw " + x + " outside the support\n" + run));
    } else {
      assertTrue(run.errorIsPlain(), expression + "\n" + run);
    }
    return run.exit();
  }

  @Provide
  Arbitrary<String> wellFormed() {
    Arbitrary<String> inner = expression(3);
    return Arbitraries.frequencyOf(
        Tuple.of(2, inner),
        Tuple.of(3, inner.map(e -> "-(" + e + ")^2")),
        Tuple.of(2, inner.map(e -> "-exp(" + e + ")")),
        Tuple.of(2, inner.map(e -> "-(" + e + ")^2/2 - x^2")),
        Tuple.of(1, inner.map(e -> "log(" + e + ") - x")));
  }

  private static Arbitrary<String> expression(int depth) {
    Arbitrary<String> leaf = Arbitraries.of("x", "x", "0.5", "2", "3", "1e-3", "1e3");
    if (depth == 0) {
      return leaf;
    }
    Arbitrary<String> smaller = Arbitraries.lazy(() -> expression(depth - 1));
    Arbitrary<String> unary =
        Combinators.combine(
                Arbitraries.of("exp", "log", "log1p", "sqrt", "square", "abs", "expit",
                    "log_expit", "lgamma", "-"),
                smaller)
            .as((f, e) -> f.equals("-") ? "-(" + e + ")" : f + "(" + e + ")");
    Arbitrary<String> binary =
        Combinators.combine(Arbitraries.of("+", "-", "*", "/", "^", "min", "max"), smaller, smaller)
            .as((op, a, b) -> op.length() > 1 ? op + "(" + a + ", " + b + ")"
                : "(" + a + ")" + op + "(" + b + ")");
    return Arbitraries.frequencyOf(Tuple.of(3, leaf), Tuple.of(2, unary), Tuple.of(2, binary));
  }

  @Provide
  Arbitrary<String[]> supports() {
    return Arbitraries.of(
        new String[] {"-inf", "inf"}, new String[] {"0", "inf"}, new String[] {"-inf", "0"},
        new String[] {"0", "1"}, new String[] {"1e-300", "1e300"}, new String[] {"-1", "2.5"},
        new String[] {"1e6", "1000000.001"});
  }
}
