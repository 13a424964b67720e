package org.hullbound.lang;

import java.util.Collection;
import java.util.Locale;
import java.util.Optional;

/**
 * Finds the valid name nearest to a misspelt one, for "did you mean ...?" hints.
 *
 * <p>Distance is the optimal-string-alignment form of the Damerau-Levenshtein distance
 * (Damerau 1964; Levenshtein 1966): insertions, deletions, substitutions and swaps of two
 * neighbouring characters each cost one. Letter case is ignored, so {@code Normal} finds {@code
 * normal}. A suggestion is made only when it is close enough to be a plausible slip: at most one
 * edit for names of up to three characters, two for up to six, three beyond, and always fewer
 * edits than the misspelt name has characters (so {@code a} never suggests {@code b}).
 */
public final class NameSuggestion {

  private NameSuggestion() {}

  /**
   * The member of {@code valid} nearest to {@code wrong}, or empty when none is close enough. Ties
   * go to the alphabetically first name, so the hint never depends on collection order.
   */
  public static Optional<String> nearest(String wrong, Collection<String> valid) {
    if (wrong == null) {
      throw new IllegalArgumentException("wrong must not be null");
    }
    if (valid == null) {
      throw new IllegalArgumentException("valid must not be null");
    }
    int allowed = allowedDistance(wrong.length());
    String best = null;
    int bestDistance = Integer.MAX_VALUE;
    for (String candidate : valid) {
      if (candidate == null) {
        continue;
      }
      int d = distance(wrong, candidate);
      if (d <= allowed
          && d < wrong.length()
          && (d < bestDistance || (d == bestDistance && candidate.compareTo(best) < 0))) {
        best = candidate;
        bestDistance = d;
      }
    }
    return Optional.ofNullable(best);
  }

  /** {@code "did you mean 'x'?"} for the nearest name, or {@code null} when there is none. */
  public static String hint(String wrong, Collection<String> valid) {
    return nearest(wrong, valid).map(name -> "did you mean '" + name + "'?").orElse(null);
  }

  /** The case-blind optimal-string-alignment distance between {@code a} and {@code b}. */
  public static int distance(String a, String b) {
    String s = a.toLowerCase(Locale.ROOT);
    String t = b.toLowerCase(Locale.ROOT);
    int n = s.length();
    int m = t.length();
    // Three rows suffice: the swap rule looks back two rows.
    int[] twoBack = new int[m + 1];
    int[] previous = new int[m + 1];
    int[] current = new int[m + 1];
    for (int j = 0; j <= m; j++) {
      previous[j] = j;
    }
    for (int i = 1; i <= n; i++) {
      current[0] = i;
      for (int j = 1; j <= m; j++) {
        int cost = s.charAt(i - 1) == t.charAt(j - 1) ? 0 : 1;
        int d = Math.min(Math.min(previous[j] + 1, current[j - 1] + 1), previous[j - 1] + cost);
        if (i > 1
            && j > 1
            && s.charAt(i - 1) == t.charAt(j - 2)
            && s.charAt(i - 2) == t.charAt(j - 1)) {
          d = Math.min(d, twoBack[j - 2] + 1);
        }
        current[j] = d;
      }
      int[] recycled = twoBack;
      twoBack = previous;
      previous = current;
      current = recycled;
    }
    return previous[m];
  }

  private static int allowedDistance(int length) {
    if (length <= 3) {
      return 1;
    }
    return length <= 6 ? 2 : 3;
  }
}
