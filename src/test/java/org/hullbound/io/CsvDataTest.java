package org.hullbound.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.Parser;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Reading data CSV (RFC 4180) into tables, and data errors end to end: each names the file, the
 * line of the row and the column number of the cell.
 */
class CsvDataTest {

  @TempDir Path folder;

  private static final String MODEL =
      String.join(
          "\n",
          "index bench = 1 .. 3",
          "index tray",
          "data  planted[tray], bench_of[tray]",
          "data  survived[tray] ~ binomial(trials = planted[tray], logit_p ="
              + " effect[bench_of[tray]])",
          "param effect[bench] ~ normal(mean = 0, sd = 1)");

  private static ModelException dataError(String csv) {
    return assertThrows(
        ModelException.class,
        () ->
            BoundModel.bind(
                Parser.parse("m.hbm", MODEL), List.of(CsvData.parse("trays.csv", csv))));
  }

  private static void at(ModelException e, String file, int line, int column, String fragment) {
    String rendered = e.render();
    assertEquals(file + ":" + line + ":" + column, e.position().toString(), rendered);
    assertTrue(rendered.contains(fragment), rendered);
  }

  @Test
  void readsHeaderRowsAndTheLineOfEachRow() {
    DataTable table =
        CsvData.parse("a.csv", "\uFEFFx,\"y, quoted\"\n1,\" 2\n\"\n\n3, 4.5 \nNA,\n");
    assertEquals(List.of("x", "y, quoted"), table.header());
    assertEquals(3, table.rowCount());
    assertEquals(2, table.line(0));
    assertEquals(1.0, table.column(0).value(0));
    assertEquals(2.0, table.column(1).value(0));
    // The quoted newline and the blank line are counted: the third record starts on line 5.
    assertEquals(5, table.line(1));
    assertEquals(4.5, table.column(1).value(1));
    assertEquals(6, table.line(2));
    assertTrue(table.column(0).missing(2));
    assertEquals("'NA'", table.column(0).shown(2));
    assertEquals("an empty cell", table.column(1).shown(2));
  }

  @Test
  void everyLineBreakCountsOnceInsideAndOutsideQuotes() {
    // RFC 4180 section 2: CRLF ends a record, a quoted cell may hold line breaks; LF and a lone
    // CR are read as line breaks too (common practice, as commons-csv does).
    DataTable table = CsvData.parse("a.csv", "x,y\r\n1,\"a\r\nb\rc\"\r2,3\n\r\n4,5");
    assertEquals(3, table.rowCount());
    assertEquals(2, table.line(0));
    assertEquals(5, table.line(1));
    assertEquals(7, table.line(2));
    assertTrue(table.column(1).invalid(0));
    assertEquals("'a\r\nb\rc'", table.column(1).shown(0));
  }

  @Test
  void keepsOnlyTheColumnsAskedForAsPrimitiveNumbers() {
    StringBuilder csv = new StringBuilder("c1,c2,c3,c4,c5,c6,c7,c8,c9,c10\n");
    for (int r = 0; r < 3; r++) {
      for (int j = 1; j <= 10; j++) {
        csv.append(j == 1 ? "" : ",").append(j == 7 ? "\"text, with a comma\"" : r * 10 + j);
      }
      csv.append('\n');
    }
    Path file = write(csv.toString());
    DataTable table = CsvData.read(file, column -> column.equals("c2") || column.equals("c9"));
    assertEquals(10, table.header().size());
    assertEquals(2, table.heldColumnCount());
    assertTrue(table.holds(1) && table.holds(8) && !table.holds(0) && !table.holds(6));
    assertEquals(22.0, table.column(1).value(2));
    assertEquals(19.0, table.column(8).value(1));
    assertThrows(IllegalArgumentException.class, () -> table.column(6));
  }

  @Test
  void aRaggedRowIsReportedEvenWhenItsColumnsAreSkipped() {
    Path file = write("x,y,z\n1,2,3\n4,5\n");
    ModelException e =
        assertThrows(ModelException.class, () -> CsvData.read(file, column -> column.equals("x")));
    at(e, file.toString(), 3, 3, "this row has 2 cells but the header has 3 columns");
  }

  @Test
  void aHeaderSeparatedBySemicolonsOrTabsNamesItsSeparator() {
    // RFC 4180 section 2: fields are separated by commas. Files saved with ';' (a spreadsheet in a
    // locale with decimal commas) or tabs are the usual mistake (common practice).
    ModelException semicolons =
        assertThrows(ModelException.class, () -> CsvData.parse("a.csv", "x;y\n1;2\n"));
    at(semicolons, "a.csv", 1, 1, "the header holds ';' but no ','; hullbound reads"
        + " comma-separated files");
    ModelException tabs =
        assertThrows(ModelException.class, () -> CsvData.parse("a.csv", "x\ty\n1\t2\n"));
    at(tabs, "a.csv", 1, 1, "the header holds tabs but no ','");
    // A one-column file is still read, and a ';' inside a quoted cell of a comma file is text.
    assertEquals(1, CsvData.parse("a.csv", "x\n1\n").rowCount());
    assertEquals(2, CsvData.parse("a.csv", "\"a;b\",y\n1,2\n").header().size());
  }

  @Test
  void aQuoteNeverClosedIsReportedWhereItOpens() {
    ModelException e =
        assertThrows(ModelException.class, () -> CsvData.parse("a.csv", "x,y\n1,2\n3,\"4\n5,6\n"));
    at(e, "a.csv", 3, 2, "not a valid CSV file: the quote that opens this cell is never closed");
  }

  @Test
  void textAfterAClosingQuoteIsReportedAtItsCell() {
    ModelException e =
        assertThrows(ModelException.class, () -> CsvData.parse("a.csv", "x,y\n1,\"2\"3\n"));
    at(e, "a.csv", 2, 2, "'3' follows the closing quote of this cell");
    // Blanks after the closing quote are allowed (commons-csv's RFC 4180 format does the same).
    assertEquals(2.0, CsvData.parse("a.csv", "x,y\n1,\"2\"  \n").column(1).value(0));
  }

  @Test
  void bytesThatAreNotUtf8AreNamedByTheirOffset() throws IOException {
    Path file = Files.createTempFile(folder, "bytes", ".csv");
    Files.write(file, new byte[] {'x', '\n', '1', '\n', (byte) 0xC3, '(', '\n'});
    UncheckedIOException e = assertThrows(UncheckedIOException.class, () -> CsvData.read(file));
    assertTrue(e.getMessage().contains("not UTF-8 text (byte 5 of 7"), e.getMessage());
  }

  @Test
  void aNonNumberCellIsReportedWithItsTextAtItsCell() {
    ModelException e = dataError("planted,bench_of,survived\n10,1,3\n10,2,4\n1O,2,4\n");
    at(e, "trays.csv", 4, 1, "'1O' in column 'planted' is not a number");
  }

  private Path write(String text) {
    try {
      Path file = Files.createTempFile(folder, "data", ".csv");
      Files.writeString(file, text);
      return file;
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }

  @Test
  void aRaggedRowIsReportedWhereItIs() {
    ModelException e =
        assertThrows(ModelException.class, () -> CsvData.parse("a.csv", "x,y\n1,2\n3\n4,5\n"));
    at(e, "a.csv", 3, 2, "this row has 1 cells but the header has 2 columns");
  }

  @Test
  void anEmptyFileHasNoHeader() {
    ModelException e = assertThrows(ModelException.class, () -> CsvData.parse("a.csv", ""));
    at(e, "a.csv", 1, 1, "a header row is needed");
  }

  @Test
  void anUnreadableFileIsAnIoError() {
    assertThrows(UncheckedIOException.class, () -> CsvData.read(Path.of("no/such/file.csv")));
  }

  @Test
  void aMissingColumnIsReportedAtTheDeclaration() {
    ModelException e = dataError("bench_of,survived\n1,3\n");
    at(e, "m.hbm", 3, 7, "no data for 'planted': no data file has a column 'planted'");
  }

  @Test
  void anExtraColumnIsReportedAtItsHeaderCell() {
    ModelException e = dataError("planted,bench_of,survived,colour\n10,1,3,red\n");
    at(e, "trays.csv", 1, 4, "column 'colour' is not a data name of the model");
  }

  @Test
  void raggedLengthsAreReportedAtTheShortRow() {
    ModelException e = dataError("planted,bench_of,survived\n10,1,3\n10,2\n");
    at(e, "trays.csv", 3, 3, "column lengths disagree");
  }

  @Test
  void anIndexOutsideItsSetNamesRowAndValue() {
    ModelException e = dataError("planted,bench_of,survived\n10,1,3\n10,2,4\n10,4,4\n");
    at(e, "trays.csv", 4, 2, "index value 4 is outside index set 'bench' (1 .. 3)");
  }

  @Test
  void aNonIntegerCountIsReportedAtItsCell() {
    ModelException e = dataError("planted,bench_of,survived\n10,1,3.5\n");
    at(e, "trays.csv", 2, 3, "not a whole number, and binomial needs a count");
  }

  @Test
  void aMissingCovariateIsAnErrorButAMissingObservationIsImputed() {
    ModelException e = dataError("planted,bench_of,survived\n10,1,3\n,2,4\n");
    at(e, "trays.csv", 3, 1, "missing value (an empty cell) for covariate 'planted[2]'");
    BoundModel model =
        BoundModel.bind(
            Parser.parse("m.hbm", MODEL),
            List.of(CsvData.parse("trays.csv", "planted,bench_of,survived\n10,1,3\n12,2,NA\n")));
    assertTrue(model.unknown("survived[2]").imputed());
  }

  @Test
  void anUnterminatedQuoteIsReportedAtItsOpeningQuoteWithoutAJavaClassName() {
    // RFC 4180, 2.5-2.7: a quoted field runs to the next lone quote; here none follows the one
    // at line 3, column 1, so the field would swallow the rest of the file.
    ModelException e =
        assertThrows(
            ModelException.class,
            () -> CsvData.parse("q.csv", "a,b\n1,\"x\"\"y\"\n\"25,2\n3,4\n"));
    assertEquals("q.csv:3:1", e.position().toString());
    assertTrue(
        e.problem().contains("never closed"), e.problem());
    org.junit.jupiter.api.Assertions.assertFalse(e.render().contains("Exception"), e.render());
    org.junit.jupiter.api.Assertions.assertFalse(e.render().contains("org."), e.render());
  }
}
