package org.hullbound.anchor;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.List;
import org.hullbound.io.CsvData;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;

/** Models the anchor's tests sample: model text bound to no data, or a bundled demo. */
final class AnchorModels {
  private AnchorModels() {}

  static BoundModel withoutData(String name, String text) {
    return BoundModel.bind(Parser.parse(SourceText.of(name + ".hbm", text)), List.of());
  }

  /** {@code models/NAME.hbm} bound to {@code models/NAME.csv}. */
  static BoundModel demo(String name) {
    return withData(name, demoText(name), demoData(name));
  }

  /** The text of {@code models/NAME.hbm}. */
  static String demoText(String name) {
    try {
      return java.nio.file.Files.readString(Path.of("models", name + ".hbm"));
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }

  /** {@code models/NAME.csv}. */
  static DataTable demoData(String name) {
    return CsvData.read(Path.of("models", name + ".csv"));
  }

  static BoundModel withData(String name, String text, DataTable data) {
    return BoundModel.bind(Parser.parse(SourceText.of(name + ".hbm", text)), List.of(data));
  }
}
