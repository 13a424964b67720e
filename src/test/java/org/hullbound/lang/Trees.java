package org.hullbound.lang;

import java.util.List;
import java.util.stream.Collectors;

/** Renders syntax trees as compact prefix text, so tests can state a whole tree in one line. */
final class Trees {
  private Trees() {}

  static String show(Expression expression) {
    if (expression instanceof Expression.Number n) {
      return number(n.value());
    }
    if (expression instanceof Expression.Name n) {
      return n.indexes().isEmpty()
          ? n.name().text()
          : n.name().text() + "[" + join(n.indexes()) + "]";
    }
    if (expression instanceof Expression.Negation n) {
      return "(neg " + show(n.operand()) + ")";
    }
    if (expression instanceof Expression.Binary b) {
      return "(" + b.operator().symbol() + " " + show(b.left()) + " " + show(b.right()) + ")";
    }
    if (expression instanceof Expression.Call c) {
      return c.function().text() + "(" + join(c.arguments()) + ")";
    }
    Expression.Sum s = (Expression.Sum) expression;
    return "sum(" + s.indexSet().text() + ": " + show(s.body()) + ")";
  }

  static String show(Distribution distribution) {
    String arguments =
        distribution.arguments().stream()
            .map(a -> a.name().text() + "=" + show(a.value()))
            .collect(Collectors.joining(", "));
    String text = distribution.family().text() + "(" + arguments + ")";
    Truncation t = distribution.truncation();
    return t == null ? text : text + " within " + show(t.lower()) + " .. " + show(t.upper());
  }

  static String show(Declarator declarator) {
    return declarator.indexSets().isEmpty()
        ? declarator.name().text()
        : declarator.name().text()
            + "["
            + declarator.indexSets().stream().map(Identifier::text).collect(Collectors.joining(", "))
            + "]";
  }

  private static String join(List<Expression> expressions) {
    return expressions.stream().map(Trees::show).collect(Collectors.joining(", "));
  }

  private static String number(double value) {
    if (value == Math.rint(value) && !Double.isInfinite(value) && Math.abs(value) < 1e15) {
      return Long.toString((long) value);
    }
    return Double.toString(value);
  }
}
