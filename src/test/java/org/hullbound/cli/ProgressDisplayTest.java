package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.time.Duration;
import java.util.concurrent.atomic.AtomicLong;
import org.hullbound.gibbs.ChainProgress;
import org.junit.jupiter.api.Test;

class ProgressDisplayTest {

  private static ChainProgress at(int chain, long sweeps, long draws, boolean finished) {
    return new ChainProgress(
        chain, sweeps, 100, 300, draws, 200, 50.0, Duration.ofSeconds(125), finished);
  }

  @Test
  void aPlainDisplayPrintsOneLineEveryFewSecondsAndAtTheEnd() {
    StringWriter text = new StringWriter();
    AtomicLong clock = new AtomicLong();
    ProgressDisplay display = ProgressDisplay.of(new PrintWriter(text), false, 2, clock::get);
    display.progress(at(0, 50, 0, false));
    clock.addAndGet(1_000_000_000L);
    display.progress(at(1, 60, 0, false));
    assertEquals("", text.toString(), "nothing within the first five seconds");
    clock.addAndGet(5_000_000_000L);
    display.progress(at(0, 150, 50, false));
    assertEquals(
        "chain 1 50/200 draws 50 draws/s 2m05s left | chain 2 burn-in 60/100 50 draws/s 2m05s left\n",
        text.toString());
    display.progress(at(0, 300, 200, true));
    display.progress(at(1, 300, 200, true));
    assertTrue(text.toString().endsWith("chain 1 200/200 draws 50 draws/s done | chain 2 200/200 draws 50 draws/s done\n"),
        text.toString());
  }

  @Test
  void aTerminalDisplayRedrawsOneLineWithBars() {
    StringWriter text = new StringWriter();
    AtomicLong clock = new AtomicLong();
    ProgressDisplay display = ProgressDisplay.of(new PrintWriter(text), true, 1, clock::get);
    clock.addAndGet(300_000_000L);
    display.progress(at(0, 150, 50, false));
    clock.addAndGet(300_000_000L);
    display.progress(at(0, 300, 200, true));
    display.finish();
    String first = "chain 1 [######......] 50/200 draws 50 draws/s 2m05s left";
    String last = "chain 1 [############] 200/200 draws 50 draws/s done";
    // The shorter last line is padded with blanks to wipe what the first one left.
    assertEquals(
        "\r" + first + "\r" + last + " ".repeat(first.length() - last.length()) + "\n",
        text.toString());
  }

  @Test
  void durationsAreShort() {
    assertEquals("42s", ProgressDisplay.format(Duration.ofSeconds(42)));
    assertEquals("3m05s", ProgressDisplay.format(Duration.ofSeconds(185)));
    assertEquals("1h02m", ProgressDisplay.format(Duration.ofSeconds(3725)));
  }
}
