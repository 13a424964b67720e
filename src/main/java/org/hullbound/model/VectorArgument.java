package org.hullbound.model;

import java.util.function.Function;
import org.hullbound.lang.Expression;
import org.hullbound.lang.ModelException;

/**
 * The vector argument of a family that takes one ({@code categorical(p = w)}): the bare name of a
 * node declared over exactly one index set, expanded into one reference per element, {@code w[lo]
 * .. w[hi]}, in the set's order, so that element k of the set (counted from 1) is category k.
 *
 * <p>Kept apart from the binder so that a vector argument is one small rule: written as a name
 * without brackets, it means the whole vector; anything else is a positioned error that says how
 * to write it.
 */
final class VectorArgument {

  /** What the binder knows of a name: its kind word, its number of index sets, its first set. */
  record Shape(String kind, int dimensions, IndexSet set) {}

  private VectorArgument() {}

  /**
   * The element references of the vector named by {@code argument}.
   *
   * @param shapes the shape of a declared name, {@code null} when there is none
   * @throws ModelException when the argument is not the bare name of a vector
   */
  static Expression[] expand(
      Expression argument, Function<String, Shape> shapes, BindingErrors errors) {
    String hint = "write the name of a vector declared over one index set, as in data w[k] ="
        + " [0.2, 0.5, 0.3] and categorical(p = w)";
    if (!(argument instanceof Expression.Name name) || !name.indexes().isEmpty()) {
      throw errors.at(argument.position(),
          "p of categorical must be a whole vector, written as its name without brackets", hint);
    }
    Shape shape = shapes.apply(name.name().text());
    if (shape == null) {
      throw errors.at(argument.position(),
          "p of categorical names '" + name.name().text() + "', which is not a declared vector",
          hint);
    }
    if (shape.dimensions() != 1) {
      throw errors.at(argument.position(),
          "p of categorical must be a vector over one index set; '" + name.name().text()
              + "' runs over " + shape.dimensions(),
          hint);
    }
    IndexSet set = shape.set();
    int count = set.upper() - set.lower() + 1;
    Expression[] elements = new Expression[count];
    for (int i = 0; i < count; i++) {
      elements[i] = new Expression.Name(name.name(),
          java.util.List.of(new Expression.Number(set.lower() + i, argument.position())),
          argument.position());
    }
    return elements;
  }
}
