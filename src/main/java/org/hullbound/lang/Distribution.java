package org.hullbound.lang;

import java.util.List;

/**
 * The right-hand side of {@code ~}: a family name, its named arguments in written order, and an
 * optional truncation ({@code null} when there is no {@code within} clause).
 */
public record Distribution(
    Identifier family, List<Argument> arguments, Truncation truncation, SourcePosition position) {
  public Distribution {
    arguments = List.copyOf(arguments);
  }
}
