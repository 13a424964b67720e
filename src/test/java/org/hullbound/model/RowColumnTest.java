package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotSame;
import static org.junit.jupiter.api.Assertions.assertSame;

import org.junit.jupiter.api.Test;

/**
 * A column of a compiled conditional's numbers ({@link RowColumn}): folded to one value when every
 * row holds the same bits, and a long column equal bit for bit to one made before (the same
 * outcome in the conditionals of several unknowns) is that array, held once.
 */
class RowColumnTest {

  private static RowColumn.Doubles column(int rows, int changed, double value) {
    RowColumn.Doubles c = new RowColumn.Doubles();
    for (int r = 0; r < rows; r++) {
      c.add(r == changed ? value : r % 7 * 0.5);
    }
    return c.finish();
  }

  @Test
  void aColumnOfOneValueIsHeldOnce() {
    RowColumn.Doubles c = new RowColumn.Doubles();
    for (int r = 0; r < 5000; r++) {
      c.add(1.0);
    }
    c.finish();
    assertEquals(0, c.stride);
    assertEquals(1, c.values.length);
    assertEquals(1.0, c.at(4321));
  }

  @Test
  void equalLongColumnsShareOneArrayAndOnlyThose() {
    RowColumn.Doubles first = column(3000, 10, 7.25);
    RowColumn.Doubles again = column(3000, 10, 7.25);
    assertSame(first.values, again.values, "the same numbers, one array");
    // 0.0 and -0.0 are equal numbers but not the same bits: a column must keep its own
    RowColumn.Doubles zero = column(3000, 14, 0.0);
    RowColumn.Doubles negativeZero = column(3000, 14, -0.0);
    assertNotSame(zero.values, negativeZero.values);
    assertEquals(Double.doubleToRawLongBits(-0.0), Double.doubleToRawLongBits(negativeZero.at(14)));
    assertNotSame(first.values, column(3000, 10, 7.5).values, "one row differs");
    assertEquals(7.25, again.at(10));
    assertEquals(1.5, again.at(3));
  }

  @Test
  void shortColumnsAreNotLookedUp() {
    int rows = RowColumn.SHARED_FROM - 1;
    assertNotSame(column(rows, 2, 9.0).values, column(rows, 2, 9.0).values);
  }
}
