package org.hullbound.lang;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/** The function table matches the list in the language design. */
class FunctionsTest {

  @Test
  void namesAreThoseOfTheDesignInItsOrder() {
    // /work/shared/design/model-language.md, section "Expressions".
    assertEquals(
        List.of(
            "exp", "log", "log1p", "expm1", "sqrt", "abs", "logit", "expit",
            "log_expit", "lgamma", "min", "max", "above", "below"),
        Functions.names());
  }

  @Test
  void theIndicatorsAloneAreForChecksOnly() {
    for (String name : Functions.names()) {
      assertEquals(name.equals("above") || name.equals("below"), Functions.checkOnly(name), name);
    }
  }

  @Test
  void minAndMaxTakeTwoArgumentsTheOthersOne() {
    for (String name : Functions.names()) {
      int expected = List.of("min", "max", "above", "below").contains(name) ? 2 : 1;
      assertEquals(expected, Functions.arity(name), name);
      assertTrue(Functions.isFunction(name));
    }
  }

  @Test
  void sumIsSyntaxNotAFunction() {
    assertFalse(Functions.isFunction("sum"));
    assertFalse(Functions.isFunction(null));
    IllegalArgumentException e =
        assertThrows(IllegalArgumentException.class, () -> Functions.arity("sum"));
    assertTrue(e.getMessage().contains("got sum"), e.getMessage());
  }
}
