package org.hullbound.model;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.hullbound.lang.Parser;

/** Builds bound models from model text and small comma-separated tables, for tests. */
final class TestModels {

  private TestModels() {}

  static BoundModel bind(String model, DataTable... tables) {
    return BoundModel.bind(Parser.parse("test.hbm", model), List.of(tables));
  }

  /** A table from lines of comma-separated cells (no quoting), the first line the header. */
  static DataTable table(String fileName, String... lines) {
    List<List<String>> rows = new ArrayList<>();
    for (int i = 1; i < lines.length; i++) {
      rows.add(Arrays.asList(lines[i].split(",", -1)));
    }
    return DataTable.of(fileName, Arrays.asList(lines[0].split(",", -1)), rows);
  }

  /** Central difference of the conditional's log-density at u, with step h. */
  static double centralDifference(ConditionalDensity c, double u, double[] state, double h) {
    return (c.logDensity(u + h, state, null) - c.logDensity(u - h, state, null)) / (2 * h);
  }
}
