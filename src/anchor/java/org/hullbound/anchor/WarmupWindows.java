package org.hullbound.anchor;

import java.util.ArrayList;
import java.util.List;

/**
 * When the No-U-Turn sampler's warm-up estimates its diagonal mass matrix: a first stretch where
 * only the step size adapts (the chain is still travelling to the typical set), then windows of
 * doubling length, each ending with a new mass matrix from the draws of that window alone, then a
 * last stretch where the step size settles to the final matrix.
 *
 * <p>Common practice (the windowed scheme Stan describes in its reference manual, with its default
 * lengths: 75 iterations first, windows from 25 doubling, 50 last; when the warm-up is shorter than
 * 150 the three take 15%, 75% and 10% of it). A window whose doubled successor would not fit
 * before the last stretch is stretched to reach it. Fewer than 20 warm-up iterations adapt the
 * step size only.
 */
final class WarmupWindows {
  private final long warmup;
  private final long first;
  private final long[] ends;

  private WarmupWindows(long warmup, long first, long[] ends) {
    this.warmup = warmup;
    this.first = first;
    this.ends = ends;
  }

  static WarmupWindows of(long warmup) {
    if (warmup < 0) {
      throw new IllegalArgumentException("warmup must be >= 0, got " + warmup);
    }
    if (warmup < 20) {
      return new WarmupWindows(warmup, warmup, new long[0]);
    }
    long first = 75;
    long last = 50;
    long size = 25;
    if (warmup < first + size + last) {
      first = (long) (0.15 * warmup);
      last = (long) (0.1 * warmup);
      size = warmup - first - last;
    }
    long slowEnd = warmup - last;
    List<Long> ends = new ArrayList<>();
    long start = first;
    while (start < slowEnd) {
      long end = start + size;
      if (end + 2 * size > slowEnd) {
        end = slowEnd;
      }
      ends.add(end);
      start = end;
      size *= 2;
    }
    return new WarmupWindows(warmup, first,
        ends.stream().mapToLong(Long::longValue).toArray());
  }

  /** Whether the draw of iteration {@code m} (counted from 0) goes into a window's estimate. */
  boolean collects(long m) {
    return ends.length > 0 && m >= first && m < ends[ends.length - 1];
  }

  /** Whether a window ends with iteration {@code m}: the mass matrix is estimated after it. */
  boolean endsWindow(long m) {
    for (long end : ends) {
      if (end == m + 1) {
        return true;
      }
    }
    return false;
  }

  /** Whether iteration {@code m} is the warm-up's last. */
  boolean endsWarmup(long m) {
    return m + 1 == warmup;
  }

  /** The window ends (iteration counts), for tests. */
  long[] ends() {
    return ends.clone();
  }
}
