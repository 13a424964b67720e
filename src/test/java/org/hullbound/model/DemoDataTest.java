package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.junit.jupiter.api.Test;

/** The bundled demo data under {@code models/} is exactly what {@link DemoData} generates. */
class DemoDataTest {

  @Test
  void everyBundledDataFileIsReproducibleFromItsSeed() throws IOException {
    for (Map.Entry<String, String> file : DemoData.files().entrySet()) {
      String bundled =
          Files.readString(Path.of("models", file.getKey()), StandardCharsets.UTF_8);
      assertEquals(file.getValue(), bundled, "models/" + file.getKey()
          + " differs from DemoData; rerun DemoData.main from the project root");
    }
  }
}
