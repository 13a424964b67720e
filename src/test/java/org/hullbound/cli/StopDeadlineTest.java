package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.concurrent.TimeUnit;
import java.util.function.LongUnaryOperator;
import org.junit.jupiter.api.Test;

/**
 * The signal hook's wait for a stopped run's files ({@link StopDeadline}), on a clock the test
 * moves: it ends when the files are written, at the limit, or once the collector has taken at
 * least half of the last five seconds (the thresholds are the class's; common practice, see its
 * comment), whatever came before.
 */
class StopDeadlineTest {
  private static final long SECOND = TimeUnit.SECONDS.toNanos(1);
  private static final long LIMIT = 30 * SECOND;

  /** A clock that each poll moves by {@code step}; the collector's time a function of the clock. */
  private static final class Clock {
    final long step;
    final LongUnaryOperator collectorMillisAt;
    long now;
    int polls;

    Clock(long step, LongUnaryOperator collectorMillisAt) {
      this.step = step;
      this.collectorMillisAt = collectorMillisAt;
    }

    StopDeadline deadline() {
      return StopDeadline.of(() -> now, () -> collectorMillisAt.applyAsLong(now), LIMIT);
    }

    /** Files written once {@code polls} polls have passed (never when negative). */
    StopDeadline.Waiting writtenAfter(int writtenAfterPolls) {
      return nanos -> {
        polls++;
        now += step;
        return writtenAfterPolls >= 0 && polls >= writtenAfterPolls;
      };
    }
  }

  /** The collector's milliseconds at {@code nanos} when it takes {@code share} of the time. */
  private static LongUnaryOperator steady(double share) {
    return nanos -> Math.round(share * nanos / 1e6);
  }

  @Test
  void aRunThatWritesItsFilesEndsTheWaitAtOnce() throws Exception {
    Clock clock = new Clock(SECOND / 10, steady(0.9));
    StopDeadline.Outcome outcome = clock.deadline().await(clock.writtenAfter(3));
    assertEquals(StopDeadline.Ending.WRITTEN, outcome.ending());
    assertEquals(3 * SECOND / 10, outcome.waitedNanos());
  }

  @Test
  void aCollectorTakingHalfTheTimeEndsTheWaitAfterOneWindow() throws Exception {
    Clock clock = new Clock(SECOND / 10, steady(0.5));
    StopDeadline.Outcome outcome = clock.deadline().await(clock.writtenAfter(-1));
    assertEquals(StopDeadline.Ending.THRASHING, outcome.ending());
    assertEquals(StopDeadline.WINDOW_NANOS, outcome.waitedNanos());
    assertEquals(0.5, outcome.collectorShare(), 1e-9);
  }

  @Test
  void aCollectorTakingLessThanHalfWaitsToTheLimit() throws Exception {
    Clock clock = new Clock(SECOND / 10, steady(0.49));
    StopDeadline.Outcome outcome = clock.deadline().await(clock.writtenAfter(-1));
    assertEquals(StopDeadline.Ending.LIMIT, outcome.ending());
    assertEquals(LIMIT, outcome.waitedNanos());
  }

  /**
   * Ten healthy seconds, then a collector that takes every moment: the wait ends 2.5 s into the
   * thrashing, when it is half of the last window, although the collector took only a fifth of
   * the time since the signal.
   */
  @Test
  void thrashingThatBeginsLateIsJudgedOnTheLastWindowAlone() throws Exception {
    long healthy = 10 * SECOND;
    Clock clock = new Clock(SECOND / 10,
        nanos -> nanos <= healthy ? 0 : Math.round((nanos - healthy) / 1e6));
    StopDeadline.Outcome outcome = clock.deadline().await(clock.writtenAfter(-1));
    assertEquals(StopDeadline.Ending.THRASHING, outcome.ending());
    assertEquals(healthy + StopDeadline.WINDOW_NANOS / 2, outcome.waitedNanos());
    assertEquals(0.5, outcome.collectorShare(), 1e-9);
  }

  /** Polls that come late (a starved thread) still judge a whole window, and so does the limit. */
  @Test
  void latePollsStillJudgeAWholeWindow() throws Exception {
    Clock clock = new Clock(3 * SECOND, steady(0.8));
    StopDeadline.Outcome outcome = clock.deadline().await(clock.writtenAfter(-1));
    assertEquals(StopDeadline.Ending.THRASHING, outcome.ending());
    assertEquals(6 * SECOND, outcome.waitedNanos(), "the first poll past a window");
    assertTrue(outcome.collectorShare() >= StopDeadline.THRASHING_SHARE);
  }

  /** The line said when the hook stops waiting names the cause, the time, and what is kept. */
  @Test
  void theLineSaysWhyTheRunEndedAndWhatItsFilesHold() {
    assertEquals("hullbound fit: the Java heap is full (the collector took 96% of the last 5 s),"
        + " so the run ends 6 s after the signal without waiting longer for its files: draws.csv"
        + " keeps its whole rows, and a file not yet written is missing, never half written",
        SignalStop.givingUp("fit", new StopDeadline.Outcome(
            StopDeadline.Ending.THRASHING, 5_600_000_000L, 0.96)));
    assertEquals("hullbound fit-units: the run ends 120 s after the signal without waiting longer"
        + " for its files: the batch's tables keep their whole rows, and a file not yet written is"
        + " missing, never half written",
        SignalStop.givingUp("fit-units", new StopDeadline.Outcome(
            StopDeadline.Ending.LIMIT, 120 * SECOND, 0.2)));
  }
}
