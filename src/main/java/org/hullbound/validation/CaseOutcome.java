package org.hullbound.validation;

import java.util.List;

/**
 * What one validation case gave: a check per quantity, or the reason it could not run.
 *
 * @param name the case's folder name
 * @param checks one per quantity, in the order of its {@code reference.csv}
 * @param failure null when the case ran, else why it did not (the case then fails)
 */
public record CaseOutcome(String name, List<QuantityCheck> checks, String failure) {
  public CaseOutcome {
    checks = List.copyOf(checks);
  }

  public boolean pass() {
    return failure == null && checks.stream().allMatch(QuantityCheck::pass);
  }
}
