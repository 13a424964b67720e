package org.hullbound.model;

/**
 * An index set of a bound model: a name and the whole numbers {@code lower .. upper} it runs
 * over.
 *
 * <p>Sized either by an {@code index set = lo .. hi} statement or by the rows of the data
 * declared over it; {@code origin} says which ("declared", or the data file's name).
 */
public record IndexSet(String name, int lower, int upper, String origin) {
  public IndexSet {
    if (name == null) {
      throw new IllegalArgumentException("name must not be null");
    }
    if (upper < lower) {
      throw new IllegalArgumentException(
          "upper must be >= lower, got " + lower + " .. " + upper + " for " + name);
    }
  }

  public int size() {
    return upper - lower + 1;
  }

  public boolean contains(double value) {
    return value >= lower && value <= upper;
  }

  /** {@code lo .. hi}, as the model language writes it. */
  public String range() {
    return lower + " .. " + upper;
  }
}
