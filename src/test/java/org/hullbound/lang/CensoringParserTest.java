package org.hullbound.lang;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** The {@code censored lo .. hi [when flag]} clause of a modelled data line. */
class CensoringParserTest {

  private static Statement only(String text) {
    ModelFile file = Parser.parse("test.hbm", text);
    assertEquals(1, file.statements().size());
    return file.statements().get(0);
  }

  private static ModelException failure(String text) {
    return assertThrows(ModelException.class, () -> Parser.parse("test.hbm", text));
  }

  @Test
  void rightCensoredWithAFlag() {
    Statement.Data data = (Statement.Data) only(
        "data hours[seal] ~ weibull(shape = k, scale = s) censored hours[seal] .. inf when running[seal]");
    Censoring censoring = data.censoring();
    assertEquals("hours[seal]", Trees.show(censoring.lower()));
    assertEquals(Double.POSITIVE_INFINITY,
        assertInstanceOf(Expression.Number.class, censoring.upper()).value());
    assertEquals("running[seal]", Trees.show(censoring.when()));
    assertEquals(new SourcePosition("test.hbm", 1, 50), censoring.position());
    assertEquals("weibull(shape=k, scale=s)", Trees.show(data.likelihood()));
  }

  @Test
  void everyRowCensoredWithoutAFlag() {
    Statement.Data data = (Statement.Data) only(
        "data level[s] ~ lognormal(meanlog = m, sdlog = 1) censored -inf .. limit[s] * 2");
    assertEquals(Double.NEGATIVE_INFINITY,
        assertInstanceOf(Expression.Number.class, data.censoring().lower()).value());
    assertEquals("(* limit[s] 2)", Trees.show(data.censoring().upper()));
    assertNull(data.censoring().when());
  }

  @Test
  void truncationComesFirst() {
    Statement.Data data = (Statement.Data) only(
        "data t[i] ~ normal(mean = 0, sd = 1) within 0 .. inf censored a[i] .. b[i]");
    assertEquals("normal(mean=0, sd=1) within 0 .. Infinity", Trees.show(data.likelihood()));
    assertEquals("a[i]", Trees.show(data.censoring().lower()));
  }

  @Test
  void theWordsStayOrdinaryNamesElsewhere() {
    ModelFile file = Parser.parse("test.hbm",
        "data censored[i], when[i]\ndata y[i] ~ normal(mean = censored[i], sd = when[i])\n");
    Statement.Data data = (Statement.Data) file.statements().get(1);
    assertNull(data.censoring());
    assertNull(((Statement.Data) file.statements().get(0)).censoring());
  }

  @Test
  void limitsMissing() {
    ModelException e = failure("data y[i] ~ normal(mean = 0, sd = 1) censored\n");
    assertEquals(46, e.position().column());
    assertTrue(e.render().contains("expected the lower limit after 'censored'"), e.render());
    assertTrue(e.render().contains("censored y_seen .. inf"), e.render());
    e = failure("data y[i] ~ normal(mean = 0, sd = 1) censored a[i]\n");
    assertTrue(e.render().contains("expected '..' between the limits after 'censored'"), e.render());
    e = failure("data y[i] ~ normal(mean = 0, sd = 1) censored a[i] .. when f[i]\n");
    assertTrue(e.render().contains("expected the upper limit after '..'"), e.render());
    e = failure("data y[i] ~ normal(mean = 0, sd = 1) censored a[i] .. inf when\n");
    assertTrue(e.render().contains("expected a 0/1 expression after 'when'"), e.render());
  }

  @Test
  void misspeltOrMisplacedClauses() {
    ModelException e = failure("data y[i] ~ normal(mean = 0, sd = 1) censured a[i] .. inf\n");
    assertTrue(e.render().contains("did you mean 'censored'?"), e.render());
    e = failure("data y[i] ~ normal(mean = 0, sd = 1) censored a[i] .. inf within 0 .. 1\n");
    assertTrue(e.render().contains("'within' must come before 'censored'"), e.render());
    e = failure("param m ~ normal(mean = 0, sd = 1) censored 0 .. 1\n");
    assertEquals(36, e.position().column());
    assertTrue(e.render().contains("a param cannot be censored"), e.render());
  }
}
