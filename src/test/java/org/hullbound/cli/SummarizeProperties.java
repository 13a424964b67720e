package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.Combinators;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import net.jqwik.api.lifecycle.AfterContainer;
import net.jqwik.api.lifecycle.BeforeContainer;
import net.jqwik.api.statistics.Statistics;
import net.jqwik.api.statistics.StatisticsReport;

/**
 * Fuzzing of {@code hullbound summarize}: whatever the draws file holds (ragged rows, unicode,
 * huge values such as 1e308 and 1e999, empty files, quotes, random bytes), the command either
 * succeeds with a report or exits 2 with a plain message on standard error; no exception escapes
 * and no stack trace is printed. Seeds are fixed so that every run explores the same files.
 */
class SummarizeProperties {

  private static Path folder;

  @BeforeContainer
  static void makeFolder() throws IOException {
    folder = Files.createTempDirectory("hullbound-summarize-fuzz");
  }

  @AfterContainer
  static void removeFolder() throws IOException {
    try (var files = Files.list(folder)) {
      for (Path file : files.toList()) {
        Files.deleteIfExists(file);
      }
    }
    Files.deleteIfExists(folder);
  }

  private static int summarizeEndsCleanly(byte[] content) throws IOException {
    Path file = Files.createTempFile(folder, "draws", ".csv");
    try {
      Files.write(file, content);
      CliRun run = CliRun.of("summarize", file.toString());
      assertTrue(run.exit() == 0 || run.exit() == 2, run.toString());
      if (run.exit() == 0) {
        assertTrue(run.out().contains("R-hat"), run.toString());
        assertTrue(!run.err().contains("Exception") && !run.err().contains("\tat "),
            run.toString());
      } else {
        assertTrue(run.errorIsPlain(), run.toString());
        assertEquals("", run.out(), run.toString());
      }
      return run.exit();
    } finally {
      Files.deleteIfExists(file);
    }
  }

  @Property(tries = 400, seed = "20261201")
  @StatisticsReport(StatisticsReport.StatisticsReportMode.OFF)
  void structuredDrawsFilesWithFaultsEndInAReportOrAMessage(
      @ForAll("drawsFiles") String text) throws IOException {
    Statistics.label("exit status").collect(summarizeEndsCleanly(text.getBytes(StandardCharsets.UTF_8)));
    // Both outcomes must be explored often, or the property would test one path only.
    Statistics.label("exit status")
        .coverage(checker -> {
          checker.check(0).percentage(p -> p >= 10);
          checker.check(2).percentage(p -> p >= 10);
        });
  }

  @Property(tries = 200, seed = "20261201")
  void randomBytesEndInAReportOrAMessage(@ForAll("bytes") byte[] content) throws IOException {
    summarizeEndsCleanly(content);
  }

  @Property(tries = 200, seed = "20261201")
  void randomCsvLikeTextEndsInAReportOrAMessage(@ForAll("csvLikeText") String text)
      throws IOException {
    summarizeEndsCleanly(text.getBytes(StandardCharsets.UTF_8));
  }

  @Provide
  Arbitrary<byte[]> bytes() {
    return Arbitraries.bytes().array(byte[].class).ofMaxSize(400);
  }

  @Provide
  Arbitrary<String> csvLikeText() {
    return Arbitraries.strings()
        .withChars(",\"\n\r 0123456789.eE-+xyNAnaif\uFEFF\u00b5\u03b2\u540d")
        .withCharRange('\u0000', '\u0020')
        .ofMaxLength(300);
  }

  /**
   * Files shaped like draws files: a header of 1 to 4 names (some unicode, some quoted, maybe a
   * chain and a draw column), 0 to 40 rows of cells that are mostly numbers but sometimes huge,
   * non-finite, missing, words or unicode, rows sometimes a cell short or long, LF or CRLF line
   * ends, and sometimes a byte-order mark.
   */
  @Provide
  Arbitrary<String> drawsFiles() {
    Arbitrary<String> names =
        Arbitraries.of("mu", "tau[1]", "beta[1,2]", "\u00b5", "\u540d\u524d", "x\"y", "a b",
            "\uD83D\uDE00", "chain", "draw", "iteration", "", " ", "\u2003", "sigma");
    Arbitrary<List<String>> header = names.list().ofMinSize(1).ofMaxSize(4);
    Arbitrary<String> number =
        Arbitraries.doubles().between(-1e3, 1e3).map(x -> Double.toString(x));
    Arbitrary<String> small = Arbitraries.integers().between(0, 4).map(k -> Integer.toString(k));
    Arbitrary<String> cell =
        Arbitraries.frequencyOf(
            net.jqwik.api.Tuple.of(30, number),
            net.jqwik.api.Tuple.of(8, small),
            net.jqwik.api.Tuple.of(2, Arbitraries.of("1e308", "-1e308", "1e999", "-1e999",
                "1.7976931348623157E308", "4.9e-324", "1e-999")),
            net.jqwik.api.Tuple.of(2, Arbitraries.of("NaN", "inf", "-inf", "Infinity")),
            net.jqwik.api.Tuple.of(2, Arbitraries.of("", "NA", "na", " ")),
            net.jqwik.api.Tuple.of(2, Arbitraries.of("abc", "1,5", "\"quoted\"", "\u00b5", "0x10",
                "\uD83D\uDE00", "1e", "--1")));
    Arbitrary<List<List<String>>> rows = cell.list().ofMaxSize(6).list().ofMaxSize(40);
    Arbitrary<Integer> shape = Arbitraries.integers().between(0, 9);
    return Combinators.combine(header, rows, shape, Arbitraries.of("\n", "\r\n"),
            Arbitraries.of(true, false))
        .as((head, body, s, end, bom) -> render(head, body, s, end, bom));
  }

  /** Rows take the header's width unless {@code shape} picks a ragged file (1 in 10). */
  private static String render(
      List<String> header, List<List<String>> body, int shape, String end, boolean bom) {
    StringBuilder text = new StringBuilder(bom ? "\uFEFF" : "");
    text.append(line(header)).append(end);
    for (List<String> row : body) {
      List<String> cells = new ArrayList<>(row);
      if (shape != 0) {
        while (cells.size() < header.size()) {
          cells.add(Integer.toString(cells.size()));
        }
        while (cells.size() > header.size()) {
          cells.remove(cells.size() - 1);
        }
      }
      text.append(line(cells)).append(end);
    }
    return text.toString();
  }

  private static String line(List<String> cells) {
    List<String> quoted = new ArrayList<>();
    for (String cell : cells) {
      boolean needsQuotes = cell.contains(",") || cell.contains("\"");
      quoted.add(needsQuotes ? "\"" + cell.replace("\"", "\"\"") + "\"" : cell);
    }
    return String.join(",", quoted);
  }
}
