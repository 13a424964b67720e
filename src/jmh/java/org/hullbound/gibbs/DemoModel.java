package org.hullbound.gibbs;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.hullbound.io.CsvData;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;

/**
 * A bundled demo model bound to its data, for the Gibbs benchmarks: {@code models/NAME.hbm} with
 * {@code models/NAME.csv} (the folder can be moved with {@code -Dhullbound.models=DIR}).
 */
final class DemoModel {
  private DemoModel() {}

  static BoundModel load(String name) throws IOException {
    return load(name, data(name));
  }

  /** {@code models/NAME.hbm} bound to {@code data} (the table of {@link #data}). */
  static BoundModel load(String name, DataTable data) throws IOException {
    String text = Files.readString(folder().resolve(name + ".hbm"), StandardCharsets.UTF_8);
    return BoundModel.bind(Parser.parse(SourceText.of(name + ".hbm", text)), List.of(data));
  }

  /** {@code models/NAME.csv}. */
  static DataTable data(String name) {
    return CsvData.read(folder().resolve(name + ".csv"));
  }

  private static Path folder() {
    return Path.of(System.getProperty("hullbound.models", "models"));
  }
}
