package org.hullbound.lang;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Nested;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/** The parser turns every statement and expression form into the tree the syntax tree describes. */
class ParserTest {

  private static List<Statement> parse(String text) {
    return Parser.parse("test.hbm", text).statements();
  }

  private static Statement only(String text) {
    List<Statement> statements = parse(text);
    assertEquals(1, statements.size(), () -> "statements of " + text);
    return statements.get(0);
  }

  private static String expression(String text) {
    Statement.Let let = (Statement.Let) only("let x = " + text);
    return Trees.show(let.value());
  }

  @Nested
  class Statements {

    @Test
    void aHyphenAfterTheTildeJoinsAFamilyName() {
      Statement.Param param =
          (Statement.Param) only("param spread ~ half-normal(sd = 1)");
      assertEquals("half-normal", param.prior().family().text());
      assertEquals(new SourcePosition("test.hbm", 1, 16), param.prior().family().position());
      Statement.Param count =
          (Statement.Param) only("param k ~ negative-binomial(mean = m, size = 2)");
      assertEquals("negative-binomial", count.prior().family().text());
    }

    @Test
    void aHyphenElsewhereIsStillMinus() {
      Statement.Param param =
          (Statement.Param) only("param y ~ normal(mean = half-normal, sd = a - b)");
      assertEquals("normal(mean=(- half normal), sd=(- a b))", Trees.show(param.prior()));
    }

    @Test
    void aSpacedHyphenInAFamilyNameShowsTheNameWithoutSpaces() {
      ModelException e =
          assertThrows(ModelException.class, () -> parse("param s ~ student - t(df = 3)"));
      assertTrue(e.render().contains("'student-t'"), e.render());
    }

    @Test
    void modelNamesTheModel() {
      Statement.ModelName model = (Statement.ModelName) only("model seedlings");
      assertEquals("seedlings", model.name().text());
      assertEquals(new SourcePosition("test.hbm", 1, 1), model.position());
      assertEquals(new SourcePosition("test.hbm", 1, 7), model.name().position());
    }

    @Test
    void indexWithBounds() {
      Statement.Index index = (Statement.Index) only("index bench = 1 .. 8");
      assertEquals("bench", index.name().text());
      assertEquals("1", Trees.show(index.lower()));
      assertEquals("8", Trees.show(index.upper()));
      assertFalse(index.sizedFromData());
    }

    @Test
    void indexBoundsWithoutSpacesAroundTheRange() {
      Statement.Index index = (Statement.Index) only("index bench = 1..8");
      assertEquals("1", Trees.show(index.lower()));
      assertEquals("8", Trees.show(index.upper()));
    }

    @Test
    void indexBoundsMayBeExpressions() {
      Statement.Index index = (Statement.Index) only("index lag = 0 .. n - 1");
      assertEquals("0", Trees.show(index.lower()));
      assertEquals("(- n 1)", Trees.show(index.upper()));
    }

    @Test
    void indexSizedFromData() {
      Statement.Index index = (Statement.Index) only("index tray");
      assertTrue(index.sizedFromData());
      assertNull(index.lower());
      assertNull(index.upper());
    }

    @Test
    void dataBareListOfNames() {
      Statement.Data data = (Statement.Data) only("data planted[tray], bench_of[tray], X[obs, coef], n");
      assertEquals(4, data.targets().size());
      assertEquals("planted[tray]", Trees.show(data.targets().get(0)));
      assertEquals("bench_of[tray]", Trees.show(data.targets().get(1)));
      assertEquals("X[obs, coef]", Trees.show(data.targets().get(2)));
      assertEquals("n", Trees.show(data.targets().get(3)));
      assertNull(data.inlineValues());
      assertNull(data.likelihood());
    }

    @Test
    void dataInlineScalar() {
      Statement.Data data = (Statement.Data) only("data n = 5");
      assertTrue(data.inlineScalar());
      assertEquals(List.of(new Statement.InlineValue(5, false, new SourcePosition("test.hbm", 1, 10))),
          data.inlineValues());
      assertNull(data.likelihood());
    }

    @Test
    void dataInlineScalarMayBeNegative() {
      Statement.Data data = (Statement.Data) only("data shift = -2.5e-1");
      assertEquals(-0.25, data.inlineValues().get(0).value());
      assertEquals(14, data.inlineValues().get(0).position().column());
    }

    @Test
    void dataInlineVectorWithMissingValues() {
      Statement.Data data = (Statement.Data) only("data y[s] = [1, -2, NA, .5]");
      assertFalse(data.inlineScalar());
      List<Statement.InlineValue> values = data.inlineValues();
      assertEquals(4, values.size());
      assertEquals(1, values.get(0).value());
      assertEquals(-2, values.get(1).value());
      assertTrue(values.get(2).missing());
      assertTrue(Double.isNaN(values.get(2).value()));
      assertFalse(values.get(3).missing());
      assertEquals(0.5, values.get(3).value());
      assertEquals(21, values.get(2).position().column());
    }

    @Test
    void dataInlineVectorOfOneValueIsNotAScalar() {
      Statement.Data data = (Statement.Data) only("data y[s] = [3]");
      assertFalse(data.inlineScalar());
      assertEquals(1, data.inlineValues().size());
    }

    @Test
    void dataInlineVectorContinuesAcrossLines() {
      Statement.Data data = (Statement.Data) only("data y[s] = [1, 2,  # first two\n  3,\n  4]\n");
      assertEquals(4, data.inlineValues().size());
      assertEquals(new SourcePosition("test.hbm", 3, 3), data.inlineValues().get(3).position());
    }

    @Test
    void dataFromFileWithLikelihood() {
      Statement.Data data =
          (Statement.Data) only("data survived[tray] ~ binomial(trials = planted[tray], p = 0.5)");
      assertEquals("survived[tray]", Trees.show(data.targets().get(0)));
      assertNull(data.inlineValues());
      assertEquals("binomial(trials=planted[tray], p=0.5)", Trees.show(data.likelihood()));
    }

    @Test
    void dataInlineWithLikelihood() {
      Statement.Data data = (Statement.Data) only("data y[s] = [0.1, NA] ~ normal(mean = mu, sd = 1)");
      assertEquals(2, data.inlineValues().size());
      assertEquals("normal(mean=mu, sd=1)", Trees.show(data.likelihood()));
    }

    @Test
    void dataLikelihoodMayBeTruncated() {
      Statement.Data data =
          (Statement.Data) only("data t[obs] ~ normal(mean = mu, sd = 1) within 0 .. inf");
      assertEquals("normal(mean=mu, sd=1) within 0 .. Infinity", Trees.show(data.likelihood()));
    }

    @Test
    void paramWithPrior() {
      Statement.Param param = (Statement.Param) only("param effect[bench] ~ normal(mean = centre, sd = spread)");
      assertEquals("effect[bench]", Trees.show(param.target()));
      assertEquals("normal(mean=centre, sd=spread)", Trees.show(param.prior()));
      assertNull(param.prior().truncation());
      assertEquals(new SourcePosition("test.hbm", 1, 23), param.prior().position());
    }

    @Test
    void paramWithTruncation() {
      Statement.Param param = (Statement.Param) only("param rate ~ gamma(shape = 2, rate = 1) within 0.5 .. 2 * k");
      Truncation truncation = param.prior().truncation();
      assertEquals("0.5", Trees.show(truncation.lower()));
      assertEquals("(* 2 k)", Trees.show(truncation.upper()));
      assertEquals(41, truncation.position().column());
    }

    @Test
    void infiniteBoundsAreInfiniteNumbers() {
      Statement.Param param = (Statement.Param) only("param z ~ normal(mean = 0, sd = 1) within -inf .. inf");
      Expression.Number lower = assertInstanceOf(Expression.Number.class, param.prior().truncation().lower());
      Expression.Number upper = assertInstanceOf(Expression.Number.class, param.prior().truncation().upper());
      assertEquals(Double.NEGATIVE_INFINITY, lower.value());
      assertEquals(Double.POSITIVE_INFINITY, upper.value());
    }

    @Test
    void familyArgumentsMaySpanLines() {
      Statement.Param param = (Statement.Param) only("param b[coef] ~ normal(\n  mean = 0,\n  sd = 10\n)\n");
      assertEquals("normal(mean=0, sd=10)", Trees.show(param.prior()));
      assertEquals(3, param.prior().arguments().get(1).name().position().line());
    }

    @Test
    void familyWithoutArgumentsParses() {
      // Whether a family needs arguments is the model package's business.
      Statement.Param param = (Statement.Param) only("param x ~ flat()");
      assertTrue(param.prior().arguments().isEmpty());
    }

    @Test
    void letWithExpression() {
      Statement.Let let = (Statement.Let) only("let eta[obs] = alpha + sum(coef: X[obs, coef] * beta[coef])");
      assertEquals("eta[obs]", Trees.show(let.target()));
      assertEquals("(+ alpha sum(coef: (* X[obs, coef] beta[coef])))", Trees.show(let.value()));
    }

    @Test
    void checkWithAReduction() {
      Statement.Check check = (Statement.Check) only("check squares = sum(obs: (y[obs] - mu) ^ 2)");
      assertEquals("squares", check.name().text());
      assertEquals("sum(obs: (^ (- y[obs] mu) 2))", Trees.show(check.value()));
      assertEquals(new SourcePosition("test.hbm", 1, 1), check.position());
    }

    @Test
    void statementPositionsAreTheirKeywords() {
      List<Statement> statements = parse("\n  model m\n\tdata n = 1\n");
      assertEquals(new SourcePosition("test.hbm", 2, 3), statements.get(0).position());
      assertEquals(new SourcePosition("test.hbm", 3, 2), statements.get(1).position());
    }

    @Test
    void blankLinesCommentsAndTrailingCommentsAreIgnored() {
      List<Statement> statements =
          parse("# heading\n\n   \nmodel m   # the name\n# closing remark");
      assertEquals(1, statements.size());
    }

    @Test
    void emptyFileHasNoStatements() {
      assertTrue(parse("").isEmpty());
      assertTrue(parse("\n\n# only a comment\n").isEmpty());
    }

    @Test
    void windowsAndOldMacLineEndsBothEndStatements() {
      assertEquals(3, parse("model m\r\nindex s\rdata n = 1\r\n").size());
    }

    @Test
    void keywordsMayBePrefixesOfNames() {
      Statement.Let let = (Statement.Let) only("let dataset = model_a + letter + within_x + NAME + infinity");
      assertEquals("(+ (+ (+ (+ model_a letter) within_x) NAME) infinity)", Trees.show(let.value()));
    }
  }

  /** {@code keep let} and {@code hide let}: whether a derived quantity goes with the draws. */
  @Nested
  class KeepingMarks {

    @Test
    void anUnmarkedLetKeepsTheDefault() {
      Statement.Let let = (Statement.Let) only("let ld50 = -alpha / beta");
      assertEquals(Statement.Keeping.DEFAULT, let.keeping());
      assertNull(let.marker());
      assertEquals(new SourcePosition("test.hbm", 1, 1), let.position());
    }

    @Test
    void keepBeforeLetMarksItKeptAndRemembersWhereTheMarkStands() {
      Statement.Let let = (Statement.Let) only("  keep let rate[site] = exp(log_rate[site])");
      assertEquals(Statement.Keeping.KEEP, let.keeping());
      assertEquals(new SourcePosition("test.hbm", 1, 3), let.marker());
      assertEquals(new SourcePosition("test.hbm", 1, 8), let.position());
      assertEquals("rate", let.target().name().text());
    }

    @Test
    void hideBeforeLetMarksItLeftOut() {
      Statement.Let let = (Statement.Let) only("hide let scratch = 2 * alpha");
      assertEquals(Statement.Keeping.HIDE, let.keeping());
      assertEquals(new SourcePosition("test.hbm", 1, 1), let.marker());
    }

    @Test
    void theMarksAreNotReservedWords() {
      List<Statement> statements =
          parse("data keep[t], hide[t]\nlet x = keep[1] + hide[2]\nparam keeps ~ normal(mean = 0, sd = 1)");
      assertEquals(3, statements.size());
      Statement.Data data = (Statement.Data) statements.get(0);
      assertEquals("keep", data.targets().get(0).name().text());
      assertEquals("(+ keep[1] hide[2])", Trees.show(((Statement.Let) statements.get(1)).value()));
    }

    @Test
    void aMarkBeforeAnotherStatementIsAnErrorAtThatStatement() {
      ModelException e =
          assertThrows(ModelException.class, () -> parse("keep param mu ~ normal(mean = 0, sd = 1)"));
      assertEquals(new SourcePosition("test.hbm", 1, 6), e.position());
      assertTrue(e.problem().contains("expected 'let' after 'keep'"), e.problem());
      assertTrue(e.hint().contains("every param is kept"), e.hint());
    }

    @Test
    void aMisspeltMarkIsSuggested() {
      ModelException e = assertThrows(ModelException.class, () -> parse("kept let x = 1"));
      assertEquals(new SourcePosition("test.hbm", 1, 1), e.position());
      assertEquals("did you mean 'keep'?", e.hint());
    }
  }


  @Nested
  class Expressions {

    @ParameterizedTest(name = "{0}  ->  {1}")
    @CsvSource(
        delimiter = '|',
        value = {
          "1 + 2 * 3           | (+ 1 (* 2 3))",
          "1 * 2 + 3           | (+ (* 1 2) 3)",
          "a - b - c           | (- (- a b) c)",
          "a / b / c           | (/ (/ a b) c)",
          "a / b * c           | (* (/ a b) c)",
          "a - b + c           | (+ (- a b) c)",
          "2 ^ 3 ^ 2           | (^ 2 (^ 3 2))",
          "-x ^ 2              | (neg (^ x 2))",
          "-2 ^ 2              | (neg (^ 2 2))",
          "2 ^ -x              | (^ 2 (neg x))",
          "a * b ^ c           | (* a (^ b c))",
          "(a + b) * c         | (* (+ a b) c)",
          "-(a + b)            | (neg (+ a b))",
          "- - x               | (neg (neg x))",
          "a - -b              | (- a (neg b))",
          "-a * b              | (* (neg a) b)",
          "a * -b              | (* a (neg b))",
          "-3                  | -3",
          "-inf                | -Infinity",
          "x[i + 1]            | x[(+ i 1)]",
          "effect[bench_of[tray]] | effect[bench_of[tray]]",
          "X[obs, coef]        | X[obs, coef]",
          "log(x) + exp(-y)    | (+ log(x) exp((neg y)))",
          "max(a, b) ^ 2       | (^ max(a, b) 2)",
          "expit(a + b[j]) | expit((+ a b[j]))",
          "sum(k: w[k]) / n    | (/ sum(k: w[k]) n)",
          "sum(i: sum(j: A[i, j])) | sum(i: sum(j: A[i, j]))",
          "((((x))))           | x",
          "1e-3 + .5 + 2.      | (+ (+ 0.001 0.5) 2)",
          "2.5E+2              | 250",
        })
    void precedenceAndAssociativity(String text, String tree) {
      assertEquals(tree, expression(text));
    }

    @Test
    void everyFunctionOfTheLanguageParsesWithItsArity() {
      for (String name : Functions.names()) {
        String call = Functions.arity(name) == 1 ? name + "(x)" : name + "(x, y)";
        // The indicators only in a check (see largestSmallestAndIndicatorsAreForChecksOnly).
        Expression value = Functions.checkOnly(name)
            ? ((Statement.Check) only("check z = " + call)).value()
            : ((Statement.Let) only("let z = " + call)).value();
        Expression.Call parsed = assertInstanceOf(Expression.Call.class, value);
        assertEquals(name, parsed.function().text());
        assertEquals(Functions.arity(name), parsed.arguments().size());
      }
    }

    @Test
    void largestSmallestAndIndicatorsAreForChecksOnly() {
      Expression.Sum top = assertInstanceOf(Expression.Sum.class,
          ((Statement.Check) only("check top = max(obs: y[obs])")).value());
      assertEquals(Expression.Reduction.MAX, top.reduction());
      assertEquals("obs", top.indexSet().text());
      assertEquals(13, top.position().column());
      Expression.Sum low = assertInstanceOf(Expression.Sum.class,
          ((Statement.Check) only("check low = min(obs: y[obs] - 1)")).value());
      assertEquals(Expression.Reduction.MIN, low.reduction());
      // Two values stay the function, in a check and anywhere else.
      assertInstanceOf(Expression.Call.class, ((Statement.Check) only("check m = max(a, b)")).value());
      assertInstanceOf(Expression.Call.class, ((Statement.Let) only("let m = min(obs, b)")).value());
      assertEquals(Expression.Reduction.SUM, assertInstanceOf(Expression.Sum.class,
          ((Statement.Let) only("let s = sum(obs: y[obs])")).value()).reduction());
      ModelException largest = assertThrows(ModelException.class, () -> only("let top = max(obs: y[obs])"));
      assertTrue(largest.render().contains("is for checks only"), largest.render());
      ModelException indicator = assertThrows(ModelException.class, () -> only("let n = above(y, 2)"));
      assertTrue(indicator.render().contains("'above' is an indicator, which only a check may use"),
          indicator.render());
      // In a check, the flag is lowered again for the next statement.
      assertThrows(ModelException.class, () -> Parser.parse("m.hbm", "check a = below(y, 1)\nlet b = below(y, 1)\n"));
    }

    @Test
    void operatorPositionsAreTheOperators() {
      Statement.Let let = (Statement.Let) only("let x = a +  b * c");
      Expression.Binary sum = (Expression.Binary) let.value();
      assertEquals(11, sum.position().column());
      assertEquals(16, sum.right().position().column());
    }

    @Test
    void negativeLiteralTakesThePositionOfItsMinus() {
      Statement.Let let = (Statement.Let) only("let x = - 4");
      assertEquals(new Expression.Number(-4, new SourcePosition("test.hbm", 1, 9)), let.value());
    }

    @Test
    void sumPositionIsTheWordSum() {
      Statement.Let let = (Statement.Let) only("let x = 1 + sum(k: w[k])");
      Expression.Sum sum = (Expression.Sum) ((Expression.Binary) let.value()).right();
      assertEquals(13, sum.position().column());
      assertEquals("k", sum.indexSet().text());
      assertEquals(17, sum.indexSet().position().column());
    }

    @Test
    void parenthesesLetAnExpressionSpanLines() {
      assertEquals("(+ a (* b c))", expression("(a +\n   b *\n   c)"));
    }

    @Test
    void nestingUpToTheLimitIsAccepted() {
      int depth = Parser.MAX_NESTING - 5;
      String text = "(".repeat(depth) + "x" + ")".repeat(depth);
      assertEquals("x", expression(text));
    }

    @Test
    void nestingBeyondTheLimitIsAModelException() {
      int depth = 100_000;
      String text = "let x = " + "(".repeat(depth) + "x" + ")".repeat(depth);
      ModelException e = assertThrows(ModelException.class, () -> parse(text));
      assertTrue(e.problem().contains("nested more than"), e.problem());
    }

    @Test
    void longChainsBeyondTheHeightLimitAreAModelException() {
      String text = "let x = a" + " + a".repeat(50_000);
      ModelException e = assertThrows(ModelException.class, () -> parse(text));
      assertTrue(e.problem().contains("too deeply nested"), e.problem());
    }

    @Test
    void manyMinusSignsAreBounded() {
      String text = "let x = " + "-".repeat(100_000) + "x";
      assertThrows(ModelException.class, () -> parse(text));
    }

    @ParameterizedTest(name = "{0}")
    @CsvSource(
        delimiter = '|',
        value = {"a[ | ]", "log( | )", "sum(k: | )", "max(1, | )", "-( | )", "2^( | )"})
    void everyKindOfNestingIsBounded(String open, String close) {
      String text = "let x = " + open.repeat(50_000) + "1" + close.repeat(50_000);
      ModelException e = assertThrows(ModelException.class, () -> parse(text));
      assertTrue(e.problem().contains("nested"), e.problem());
    }

    @Test
    void anExpressionAloneParses() {
      assertEquals(
          "(+ a (* 2 b))", Trees.show(Parser.parseExpression("e", "\n a + 2 * b\n\n")));
      ModelException e =
          assertThrows(ModelException.class, () -> Parser.parseExpression("e", "a + b c"));
      assertEquals(new SourcePosition("e", 1, 7), e.position());
      assertThrows(ModelException.class, () -> Parser.parseExpression("e", "a\nb"));
    }

    @Test
    void longPowerTowersAreBounded() {
      String text = "let x = 2" + " ^ 2".repeat(100_000);
      assertThrows(ModelException.class, () -> parse(text));
    }
  }

  @Test
  void designDocumentExampleParses() {
    // The example of /work/shared/design/model-language.md, verbatim.
    String text =
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
        """;
    ModelFile file = Parser.parse("seedlings.hbm", text);
    List<Statement> s = file.statements();
    assertEquals(8, s.size());
    assertEquals("seedlings", ((Statement.ModelName) s.get(0)).name().text());
    assertEquals("bench", ((Statement.Index) s.get(1)).name().text());
    assertTrue(((Statement.Index) s.get(2)).sizedFromData());
    assertEquals(2, ((Statement.Data) s.get(3)).targets().size());
    Statement.Data survived = (Statement.Data) s.get(4);
    assertEquals(
        "binomial(trials=planted[tray], logit_p=effect[bench_of[tray]])",
        Trees.show(survived.likelihood()));
    assertEquals("normal(mean=0, sd=2.5)", Trees.show(((Statement.Param) s.get(5)).prior()));
    assertEquals("half-normal(sd=1)", Trees.show(((Statement.Param) s.get(6)).prior()));
    assertEquals("normal(mean=centre, sd=spread)", Trees.show(((Statement.Param) s.get(7)).prior()));
    assertEquals("seedlings.hbm", file.source().fileName());
    assertEquals("model seedlings", file.source().line(2));
  }

  @Test
  void regressionExampleFromTheDesignParses() {
    String text =
        """
        # Invented scenario: a small linear regression with a truncated noise scale
        index obs
        index coef = 1 .. 3
        data X[obs, coef]
        data y[obs] ~ normal(mean = eta[obs], sd = sigma)
        param alpha ~ normal(mean = 0, sd = 10)
        param beta[coef] ~ normal(mean = 0, sd = 2)
        param sigma ~ half-cauchy(scale = 1) within 0 .. 50
        let eta[obs] = alpha + sum(coef: X[obs, coef] * beta[coef])
        """;
    assertEquals(8, parse(text).size());
  }

  @Test
  void nullArgumentsAreRejectedByName() {
    IllegalArgumentException e =
        assertThrows(IllegalArgumentException.class, () -> Parser.parse("f", null));
    assertTrue(e.getMessage().contains("text"));
    assertThrows(IllegalArgumentException.class, () -> Parser.parse(null, "model m"));
    assertThrows(IllegalArgumentException.class, () -> Parser.parse((SourceText) null));
  }
}
