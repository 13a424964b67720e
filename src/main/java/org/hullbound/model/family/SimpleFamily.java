package org.hullbound.model.family;

import java.util.List;
import java.util.function.Function;

/** A family as a name and its parametrisations, which are built knowing their family. */
final class SimpleFamily implements Family {
  private final String name;
  private final List<Parametrisation> parametrisations;

  private SimpleFamily(String name, Function<Family, List<Parametrisation>> build) {
    this.name = name;
    this.parametrisations = List.copyOf(build.apply(this));
  }

  static Family of(String name, Function<Family, List<Parametrisation>> build) {
    return new SimpleFamily(name, build);
  }

  @Override
  public String name() {
    return name;
  }

  @Override
  public List<Parametrisation> parametrisations() {
    return parametrisations;
  }

  @Override
  public String toString() {
    return name;
  }
}
