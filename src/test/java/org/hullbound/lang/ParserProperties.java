package org.hullbound.lang;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.Combinators;
import net.jqwik.api.Example;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import net.jqwik.api.statistics.Statistics;

/**
 * Mutation fuzzing of valid models: whatever is deleted, doubled, swapped or inserted, the parser
 * either succeeds or throws a {@link ModelException} whose position lies inside the file, and it
 * does so quickly. Seeds are fixed so that every run explores the same inputs.
 */
class ParserProperties {

  /** Valid models of invented scenarios, together covering every statement and expression form. */
  static final List<String> CORPUS =
      List.of(
          """
          # Seedling survival on greenhouse benches (invented data)
          model seedlings
          index bench = 1 .. 8
          index tray
          data  planted[tray], bench_of[tray]
          data  survived[tray] ~ binomial(trials = planted[tray], logit_p = effect[bench_of[tray]])
          param centre ~ normal(mean = 0, sd = 2.5)
          param spread ~ half-normal(sd = 1)
          param effect[bench] ~ normal(mean = centre, sd = spread)
          """,
          """
          # Invented scenario: reaction times of a small panel
          model reaction
          index obs
          index coef = 1 .. 3
          data X[obs, coef]
          data rt[obs] ~ lognormal(meanlog = eta[obs], sdlog = sigma)
          param alpha ~ normal(mean = 0, sd = 10)
          param beta[coef] ~ normal(mean = 0, sd = 2)
          param sigma ~ half-cauchy(scale = 1) within 0 .. 50
          let eta[obs] = alpha + sum(coef: X[obs, coef] * beta[coef])
          """,
          """
          # Invented scenario: counts at five traps, one reading lost
          index trap = 1..5
          data n = 5
          data shift = -0.25
          data count[trap] = [3, 0, NA, 7,
                              2]   # the third trap was flooded
          data count2[trap] = [1.5e1, .5, 2., -1e-3, 4] ~ normal(mean = mu, sd = 1)
          param log_rate ~ normal(mean = 0, sd = 1) within -inf .. inf
          let rate[trap] = exp(log_rate) * (1 + shift) ^ 2 - -x ^ 2 ^ 3 / max(n, 1)
          let z = expit(log1p(abs(shift)) - min(sqrt(n^2), lgamma(n))) + log_expit(expm1(1))
          data y[trap] ~ poisson(rate = rate[trap])
          """);

  private static final Pattern PIECE =
      Pattern.compile(
          "[A-Za-z_][A-Za-z0-9_]*|[0-9]*\\.?[0-9]+(?:[eE][-+]?[0-9]+)?\\.?|\\.\\.|#[^\\n]*|\\s+|.",
          Pattern.DOTALL);

  private static final List<String> HUGE =
      List.of(
          "1e999", "999999999999999999999", "1e-999", "-1e999", "1e308", "1.8e308", "4.9e-324",
          "2e-324", "0e0", "00000000000000000000000001", "1" + "0".repeat(400), "0." + "0".repeat(400) + "1",
          "inf", "-inf", "NA");

  private static final List<String> INSERTS =
      List.of(
          "(", ")", "[", "]", "~", "=", ",", ":", "..", "...", ".", "+", "-", "*", "/", "^", "#",
          "\n", "\r", "\r\n", "\t", " ", "model", "index", "data", "param", "let", "within", "NA",
          "inf", "sum", "sum(", "log(", "\u00e9", "\u03c3", "\u2212", "\u00a0", "\uFEFF",
          "\uD83C\uDF31", "\uD800", "\uDC00", "\u0000", "\u200B", "\"", "'", ";", "{", "}", "@",
          "$", "\\", "\u0007", "((((((((", "]]]]]", "------", "^^^^", "1e", "1e+", "2..", "..3");

  @Property(tries = 3000, seed = "20240611")
  void mutatedModelsParseOrFailWithAPositionedModelException(@ForAll("mutants") String text) {
    parseWithinBoundedTime(text);
  }

  @Property(tries = 1000, seed = "20240612")
  void randomGarbageParsesOrFailsWithAModelException(@ForAll("garbage") String text) {
    parseWithinBoundedTime(text);
  }

  @Property(tries = 300, seed = "20240613")
  void printedExpressionsParseBackToTheSameTree(@ForAll("expressions") Expression expression) {
    String printed = print(expression);
    Statement.Let let = (Statement.Let) Parser.parse("p.hbm", "let x = " + printed).statements().get(0);
    assertEquals(Trees.show(expression), Trees.show(let.value()), printed);
  }

  @Example
  void everyCorpusModelIsValid() {
    for (String model : CORPUS) {
      assertTrue(Parser.parse("corpus.hbm", model).statements().size() >= 8);
    }
  }

  // ------------------------------------------------------------------ checks

  private static void parseWithinBoundedTime(String text) {
    // One parse of these inputs takes well under a millisecond; a second means a runaway loop.
    String outcome =
        assertTimeoutPreemptively(Duration.ofSeconds(5), () -> parseOrModelException(text));
    Statistics.collect(outcome);
  }

  private static String parseOrModelException(String text) {
    SourceText source = SourceText.of("fuzz.hbm", text);
    try {
      Parser.parse(source);
      return "parsed";
    } catch (ModelException e) {
      SourcePosition at = e.position();
      assertEquals("fuzz.hbm", at.file());
      assertTrue(at.line() >= 1 && at.line() <= source.lineCount(), () -> "line of " + e.render());
      String line = source.line(at.line());
      int lastColumn = line.codePointCount(0, line.length()) + 1;
      assertTrue(at.column() >= 1 && at.column() <= lastColumn, () -> "column of " + e.render());
      assertTrue(e.render().startsWith(at + ": "), e::render);
      assertTrue(!e.problem().isBlank());
      return "ModelException";
    }
  }

  // ------------------------------------------------------------------ generators

  @Provide
  Arbitrary<String> mutants() {
    return Combinators.combine(
            Arbitraries.of(CORPUS), Arbitraries.integers().between(1, 4), Arbitraries.randoms())
        .as(ParserProperties::mutate);
  }

  @Provide
  Arbitrary<String> garbage() {
    Arbitrary<String> pieces = Arbitraries.oneOf(Arbitraries.of(INSERTS), Arbitraries.of(HUGE),
        Arbitraries.strings().withCharRange('\u0000', '\u00ff').ofMaxLength(3),
        Arbitraries.strings().all().ofMaxLength(2));
    return pieces.list().ofMaxSize(60).map(list -> String.join("", list));
  }

  @Provide
  Arbitrary<Expression> expressions() {
    return Arbitraries.randoms().map(random -> randomExpression(random, 5));
  }

  static String mutate(String model, int mutations, Random random) {
    List<String> pieces = new ArrayList<>();
    Matcher m = PIECE.matcher(model);
    while (m.find()) {
      pieces.add(m.group());
    }
    for (int k = 0; k < mutations && !pieces.isEmpty(); k++) {
      int i = random.nextInt(pieces.size());
      switch (random.nextInt(6)) {
        case 0 -> pieces.remove(i);
        case 1 -> pieces.add(i, pieces.get(i));
        case 2 -> {
          int j = random.nextInt(pieces.size());
          String held = pieces.get(i);
          pieces.set(i, pieces.get(j));
          pieces.set(j, held);
        }
        case 3 -> pieces.add(i, INSERTS.get(random.nextInt(INSERTS.size())));
        case 4 -> pieces.add(i, randomBytes(random));
        default -> replaceANumber(pieces, random);
      }
    }
    return String.join("", pieces);
  }

  private static String randomBytes(Random random) {
    byte[] bytes = new byte[1 + random.nextInt(4)];
    random.nextBytes(bytes);
    // Decoding arbitrary bytes as Latin-1 keeps every byte as one character, controls included.
    return new String(bytes, java.nio.charset.StandardCharsets.ISO_8859_1);
  }

  private static void replaceANumber(List<String> pieces, Random random) {
    List<Integer> numbers = new ArrayList<>();
    for (int i = 0; i < pieces.size(); i++) {
      if (!pieces.get(i).isEmpty() && Character.isDigit(pieces.get(i).charAt(0))) {
        numbers.add(i);
      }
    }
    if (!numbers.isEmpty()) {
      pieces.set(numbers.get(random.nextInt(numbers.size())), HUGE.get(random.nextInt(HUGE.size())));
    }
  }

  private static final SourcePosition NOWHERE = new SourcePosition("p.hbm", 1, 1);
  private static final List<String> NAMES = List.of("a", "b", "mu", "x_2", "effect");

  static Expression randomExpression(Random random, int depth) {
    int choice = depth <= 0 ? random.nextInt(2) : random.nextInt(8);
    switch (choice) {
      case 0:
        double[] values = {0, 1, 2.5, 1e-3, 1e21, 0.1, 7};
        return new Expression.Number(values[random.nextInt(values.length)], NOWHERE);
      case 1:
        return name(NAMES.get(random.nextInt(NAMES.size())), List.of());
      case 2:
        List<Expression> indexes = new ArrayList<>();
        for (int i = 0, n = 1 + random.nextInt(2); i < n; i++) {
          indexes.add(randomExpression(random, depth - 1));
        }
        return name(NAMES.get(random.nextInt(NAMES.size())), indexes);
      case 3:
        Expression operand = randomExpression(random, depth - 1);
        if (operand instanceof Expression.Number) {
          // A minus before a literal folds into the literal, so it is not a Negation.
          operand = name("n", List.of());
        }
        return new Expression.Negation(operand, NOWHERE);
      case 4:
        // The indicators are for checks only, and these expressions are read as lets.
        List<String> anywhere =
            Functions.names().stream().filter(name -> !Functions.checkOnly(name)).toList();
        String function = anywhere.get(random.nextInt(anywhere.size()));
        List<Expression> arguments = new ArrayList<>();
        for (int i = 0; i < Functions.arity(function); i++) {
          arguments.add(randomExpression(random, depth - 1));
        }
        return new Expression.Call(new Identifier(function, NOWHERE), arguments, NOWHERE);
      case 5:
        return new Expression.Sum(new Identifier("k", NOWHERE), randomExpression(random, depth - 1), NOWHERE);
      default:
        Expression.Operator[] operators = Expression.Operator.values();
        return new Expression.Binary(
            operators[random.nextInt(operators.length)],
            randomExpression(random, depth - 1),
            randomExpression(random, depth - 1),
            NOWHERE);
    }
  }

  private static Expression name(String text, List<Expression> indexes) {
    return new Expression.Name(new Identifier(text, NOWHERE), indexes, NOWHERE);
  }

  /** Prints with the fewest parentheses the precedence rules allow. */
  static String print(Expression e) {
    if (e instanceof Expression.Number n) {
      return Double.toString(n.value());
    }
    if (e instanceof Expression.Name n) {
      return n.indexes().isEmpty() ? n.name().text() : n.name().text() + "[" + printAll(n.indexes()) + "]";
    }
    if (e instanceof Expression.Call c) {
      return c.function().text() + "(" + printAll(c.arguments()) + ")";
    }
    if (e instanceof Expression.Sum s) {
      return "sum(" + s.indexSet().text() + ": " + print(s.body()) + ")";
    }
    if (e instanceof Expression.Negation n) {
      return "-" + wrap(n.operand(), level(n.operand()) < 3);
    }
    Expression.Binary b = (Expression.Binary) e;
    int level = level(b);
    boolean wrapLeft;
    boolean wrapRight;
    if (b.operator() == Expression.Operator.POWER) {
      wrapLeft = level(b.left()) <= 4;
      wrapRight = level(b.right()) < 3;
    } else {
      wrapLeft = level(b.left()) < level;
      wrapRight = level(b.right()) <= level;
    }
    return wrap(b.left(), wrapLeft) + " " + b.operator().symbol() + " " + wrap(b.right(), wrapRight);
  }

  private static String wrap(Expression e, boolean parenthesise) {
    return parenthesise ? "(" + print(e) + ")" : print(e);
  }

  private static String printAll(List<Expression> expressions) {
    List<String> printed = new ArrayList<>();
    expressions.forEach(x -> printed.add(print(x)));
    return String.join(", ", printed);
  }

  private static int level(Expression e) {
    if (e instanceof Expression.Binary b) {
      return switch (b.operator()) {
        case ADD, SUBTRACT -> 1;
        case MULTIPLY, DIVIDE -> 2;
        case POWER -> 4;
      };
    }
    return e instanceof Expression.Negation ? 3 : 5;
  }
}
