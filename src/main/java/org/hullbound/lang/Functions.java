package org.hullbound.lang;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * The functions that expressions of the model language may call, with the number of arguments
 * each takes.
 *
 * <p>One table shared by the parser (which rejects unknown functions and wrong argument counts)
 * and the compiler (which implements each of them), so the two can never disagree. The reduction
 * {@code sum(set: body)} is syntax of its own and not in this table.
 */
public final class Functions {

  private static final Map<String, Integer> ARITY = table();

  private Functions() {}

  private static Map<String, Integer> table() {
    Map<String, Integer> arity = new LinkedHashMap<>();
    for (String unary :
        List.of(
            "exp", "log", "log1p", "expm1", "sqrt", "abs", "logit", "expit", "log_expit", "lgamma")) {
      arity.put(unary, 1);
    }
    arity.put("min", 2);
    arity.put("max", 2);
    arity.put("above", 2);
    arity.put("below", 2);
    return Map.copyOf(arity);
  }

  /**
   * The indicators {@code above(x, c)} (1 when x &gt; c, else 0) and {@code below(x, c)} (1 when x
   * &lt; c): allowed in {@code check} statements only, like the reductions {@code max(set: ...)}
   * and {@code min(set: ...)}, because a step has no slope for a sampler to use.
   */
  public static boolean checkOnly(String name) {
    return "above".equals(name) || "below".equals(name);
  }

  /** Every function name, in the order the language documentation lists them. */
  public static List<String> names() {
    return List.of(
        "exp", "log", "log1p", "expm1", "sqrt", "abs", "logit", "expit", "log_expit", "lgamma",
        "min", "max", "above", "below");
  }

  /**
   * What to write instead of a function name that hullbound no longer has (FORMER_NAMES: the
   * renaming script leaves this table alone), or {@code null} for any other name.
   */
  public static String replacementHint(String name) {
    return FORMER_NAMES.get(name);
  }

  private static final Map<String, String> FORMER_NAMES =
      Map.of(
          "inv_logit", "did you mean 'expit'? (the inverse logit)",
          "log_inv_logit", "did you mean 'log_expit'? (the log of the inverse logit)",
          "square", "write x ^ 2 for the square of x");

  /** True when {@code name} is one of the language's functions. */
  public static boolean isFunction(String name) {
    return name != null && ARITY.containsKey(name);
  }

  /**
   * The number of arguments {@code name} takes.
   *
   * @throws IllegalArgumentException when {@code name} is not a function of the language
   */
  public static int arity(String name) {
    Integer arity = name == null ? null : ARITY.get(name);
    if (arity == null) {
      throw new IllegalArgumentException(
          "name must be one of the functions " + names() + ", got " + name);
    }
    return arity;
  }
}
