package org.hullbound.cli;

import org.hullbound.gibbs.RunSettings;
import picocli.CommandLine.Option;

/**
 * {@code --chains}, {@code --draws}, {@code --burn-in} and {@code --thin}, the size of a Gibbs run,
 * declared once for {@code fit} and {@code fit-units} as a picocli mixin.
 */
public final class SweepOptions {

  @Option(
      names = "--chains",
      paramLabel = "N",
      description = "Chains; fit runs them in parallel, fit-units one after another within a unit"
          + " (default: ${DEFAULT-VALUE}).")
  int chains = RunSettings.DEFAULT_CHAINS;

  @Option(
      names = "--draws",
      paramLabel = "N",
      description = "Kept draws per chain (default: ${DEFAULT-VALUE}).")
  int draws = RunSettings.DEFAULT_DRAWS;

  @Option(
      names = "--burn-in",
      paramLabel = "N",
      description = "Sweeps discarded first (default: ${DEFAULT-VALUE}).")
  int burnIn = RunSettings.DEFAULT_BURN_IN;

  @Option(
      names = "--thin",
      paramLabel = "K",
      description = "Keep every K-th sweep (default: ${DEFAULT-VALUE}).")
  int thin = 1;
}
