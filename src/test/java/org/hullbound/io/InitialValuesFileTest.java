package org.hullbound.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import org.hullbound.lang.ModelException;
import org.junit.jupiter.api.Test;

class InitialValuesFileTest {

  @Test
  void readsNamesAndValuesWithAnOptionalHeader() {
    Map<String, Double> values =
        InitialValuesFile.parse("init.csv", "name,value\nspread,0.5\n\"effect[3]\",-1.25\n");
    assertEquals(List.of("spread", "effect[3]"), List.copyOf(values.keySet()));
    assertEquals(0.5, values.get("spread"));
    assertEquals(-1.25, values.get("effect[3]"));
    assertEquals(Map.of("mu", 2.0), InitialValuesFile.parse("init.csv", "mu,2\n"));
  }

  @Test
  void aValueThatIsNotANumberIsPositioned() {
    ModelException e =
        assertThrows(
            ModelException.class,
            () -> InitialValuesFile.parse("init.csv", "name,value\nspread,wide\n"));
    assertEquals("init.csv:2:8", e.position().toString());
    assertTrue(e.problem().contains("'wide'"), e.problem());
    assertTrue(e.render().contains("spread,wide"));
  }

  @Test
  void aRepeatedNameAndAMissingFieldAreErrors() {
    ModelException repeated =
        assertThrows(ModelException.class, () -> InitialValuesFile.parse("i.csv", "a,1\na,2\n"));
    assertEquals(2, repeated.position().line());
    ModelException short_ =
        assertThrows(ModelException.class, () -> InitialValuesFile.parse("i.csv", "a,1\nb\n"));
    assertTrue(short_.problem().contains("two fields"));
    assertThrows(ModelException.class, () -> InitialValuesFile.parse("i.csv", "a,inf\n"));
  }

  @org.junit.jupiter.params.ParameterizedTest
  @org.junit.jupiter.params.provider.ValueSource(strings = {"22d", "2.2e1f", "0x1.6p4", "1e999"})
  void javaNumberFormsAndOverflowAreRefusedAtTheValue(String written) {
    // Double.parseDouble reads the first three as 22 and the last as infinity (Java SE
    // Double.valueOf grammar); the model language's grammar (docs/model-language.md) has none.
    ModelException e =
        assertThrows(
            ModelException.class,
            () -> InitialValuesFile.parse("init.csv", "spread," + written + "\n"));
    assertEquals("init.csv:1:8", e.position().toString());
    assertTrue(e.problem().contains("'" + written + "'"), e.problem());
  }

  @Test
  void anUnterminatedQuoteIsReportedAtItsOpeningQuote() {
    ModelException e =
        assertThrows(
            ModelException.class,
            () -> InitialValuesFile.parse("init.csv", "mu,1\nspread,\"0.5\n"));
    assertEquals("init.csv:2:8", e.position().toString());
    assertTrue(e.problem().contains("never closed"), e.problem());
    assertTrue(!e.render().contains("Exception"), e.render());
  }
}
