package org.hullbound.io;

import static org.junit.jupiter.api.Assertions.assertDoesNotThrow;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.Closeable;
import java.io.IOException;
import java.util.concurrent.atomic.AtomicBoolean;
import org.junit.jupiter.api.Test;

/** Closing quietly: the close happens, its IOException does not reach the caller, null is fine. */
class ClosingTest {
  @Test
  void aFailingCloseIsTriedAndItsExceptionDropped() {
    AtomicBoolean tried = new AtomicBoolean();
    Closeable failing = () -> {
      tried.set(true);
      throw new IOException("disk gone");
    };
    assertDoesNotThrow(() -> Closing.quietly(failing));
    assertTrue(tried.get());
    assertDoesNotThrow(() -> Closing.quietly(null));
  }
}
