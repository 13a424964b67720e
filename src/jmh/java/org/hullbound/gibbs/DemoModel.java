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

/**
 * A bundled demo model bound to its data, for the Gibbs benchmarks: {@code models/NAME.hbm} with
 * {@code models/NAME.csv} (the folder can be moved with {@code -Dhullbound.models=DIR}).
 */
final class DemoModel {
  private DemoModel() {}

  static BoundModel load(String name) throws IOException {
    Path folder = Path.of(System.getProperty("hullbound.models", "models"));
    String text = Files.readString(folder.resolve(name + ".hbm"), StandardCharsets.UTF_8);
    return BoundModel.bind(
        Parser.parse(SourceText.of(name + ".hbm", text)),
        List.of(CsvData.read(folder.resolve(name + ".csv"))));
  }
}
