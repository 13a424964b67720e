package org.hullbound.lang;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;

/**
 * The catalogue of bad model files ({@code bad/cases.tsv}): each one fails with a {@link
 * ModelException} at the stated line and column whose problem or hint contains the stated words.
 */
class BadModelTest {

  private static final String FOLDER = "/org/hullbound/lang/bad/";

  static List<Arguments> cases() {
    List<Arguments> cases = new ArrayList<>();
    for (String row : read("cases.tsv").split("\n")) {
      if (row.isBlank() || row.startsWith("#")) {
        continue;
      }
      String[] cells = row.split("\t", -1);
      assertEquals(4, cells.length, () -> "cells of row " + row);
      cases.add(
          Arguments.of(
              cells[0], Integer.parseInt(cells[1]), Integer.parseInt(cells[2]), cells[3]));
    }
    return cases;
  }

  @ParameterizedTest(name = "{0} fails at {1}:{2}")
  @MethodSource("cases")
  void failsWithAPositionedMessage(String file, int line, int column, String fragment) {
    String text = read(file);
    ModelException e = assertThrows(ModelException.class, () -> Parser.parse(file, text));
    String said = e.problem() + (e.hint() == null ? "" : " " + e.hint());
    assertTrue(said.contains(fragment), () -> "message of " + file + " was: " + said);
    assertEquals(new SourcePosition(file, line, column), e.position(), () -> e.render());
    String rendered = e.render();
    assertTrue(rendered.startsWith(file + ":" + line + ":" + column + ": "), rendered);
  }

  @Test
  void catalogueHasAtLeastTwentyFiveFiles() {
    assertTrue(cases().size() >= 25, "size " + cases().size());
  }

  private static String read(String name) {
    try (InputStream in = BadModelTest.class.getResourceAsStream(FOLDER + name)) {
      assertNotNull(in, () -> "missing test resource " + name);
      return new String(in.readAllBytes(), StandardCharsets.UTF_8);
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }
}
