package org.hullbound.cli;

import java.util.function.LongSupplier;
import picocli.CommandLine.Option;

/**
 * {@code --seed}, declared once for every command that draws random numbers, as a picocli mixin.
 */
public final class SeedOption {

  @Option(
      names = "--seed",
      paramLabel = "S",
      description =
          "Seed of the random generators; the same seed and settings give the same results"
              + " (default: fit, fit-units and draw draw one and print it, validate and"
              + " calibrate use a fixed one).")
  Long seed;

  /** The seed given, or null. */
  Long given() {
    return seed;
  }

  /** The seed given, else {@code otherwise}'s. */
  long orElse(LongSupplier otherwise) {
    return seed != null ? seed : otherwise.getAsLong();
  }
}
