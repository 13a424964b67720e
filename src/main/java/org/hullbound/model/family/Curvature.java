package org.hullbound.model.family;

import java.util.Objects;

/**
 * A fact about the concavity of a log-density, with the reason in words.
 *
 * <p>Adaptive rejection sampling (Gilks and Wild 1992) is exact only for log-concave targets, and a
 * full conditional is log-concave when each of its terms is; these facts are the terms' part of that
 * argument, and the reasons are what {@code check} shows to the user.
 *
 * @param concave {@code true} when concavity is established for every value the unknown quantities
 *     may take; {@code false} means "not established", not "convex"
 * @param reason one short sentence: the second derivative, or why concavity fails or when it would
 *     hold
 */
public record Curvature(boolean concave, String reason) {
  public Curvature {
    Objects.requireNonNull(reason, "reason");
  }

  /** An established concavity. */
  public static Curvature concave(String reason) {
    return new Curvature(true, reason);
  }

  /** Concavity not established, with the reason (or the condition under which it would hold). */
  public static Curvature notEstablished(String reason) {
    return new Curvature(false, reason);
  }
}
