package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.stream.Stream;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.Parser;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * The catalogue of semantically bad model and data files ({@code bad/cases.tsv}): each must fail
 * binding with a {@link ModelException} at the stated file, line and column, whose rendering
 * contains the stated fragment. The positions were worked out from each file's text.
 */
class BadModelCatalogueTest {

  private static final String FOLDER = "/org/hullbound/model/bad/";

  static Stream<Arguments> cases() {
    List<Arguments> cases = new ArrayList<>();
    for (String line : read("cases.tsv").split("\n")) {
      if (line.isBlank() || line.startsWith("#")) {
        continue;
      }
      String[] f = line.split("\t");
      cases.add(
          Arguments.of(f[0], f[1], Integer.parseInt(f[2]), Integer.parseInt(f[3]), f[4]));
    }
    return cases.stream();
  }

  @ParameterizedTest(name = "{0}")
  @MethodSource("cases")
  void failsAtTheStatedPlaceWithTheStatedMessage(
      String modelFile, String file, int line, int column, String fragment) {
    String base = modelFile.substring(0, modelFile.length() - ".hbm".length());
    // A ragged row fails while its table is built, so the tables are built inside the check.
    ModelException e =
        assertThrows(
            ModelException.class,
            () -> {
              List<DataTable> tables = new ArrayList<>();
              for (String data : List.of(base + ".csv", base + ".2.csv")) {
                String text = readIfPresent(data);
                if (text != null) {
                  tables.add(table(data, text));
                }
              }
              BoundModel.bind(Parser.parse(modelFile, read(modelFile)), tables);
            });
    String rendered = e.render();
    assertTrue(rendered.contains(fragment), rendered);
    assertEquals(file, e.position().file(), rendered);
    assertEquals(line, e.position().line(), rendered);
    assertEquals(column, e.position().column(), rendered);
    if (file.endsWith(".hbm")) {
      // The offending line is quoted with a caret under the fault.
      assertTrue(rendered.contains("  | " + read(modelFile).split("\n")[line - 1]), rendered);
      assertTrue(rendered.contains("^"), rendered);
    }
  }

  private static DataTable table(String name, String text) {
    String[] lines = text.split("\n");
    List<List<String>> rows = new ArrayList<>();
    for (int i = 1; i < lines.length; i++) {
      rows.add(Arrays.asList(lines[i].split(",", -1)));
    }
    return DataTable.of(name, Arrays.asList(lines[0].split(",", -1)), rows);
  }

  private static String read(String name) {
    String text = readIfPresent(name);
    if (text == null) {
      throw new IllegalStateException("missing test resource " + name);
    }
    return text;
  }

  private static String readIfPresent(String name) {
    try (InputStream in = BadModelCatalogueTest.class.getResourceAsStream(FOLDER + name)) {
      return in == null ? null : new String(in.readAllBytes(), StandardCharsets.UTF_8);
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }
}
