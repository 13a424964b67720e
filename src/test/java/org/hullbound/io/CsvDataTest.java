package org.hullbound.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.UncheckedIOException;
import java.nio.file.Path;
import java.util.List;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.Parser;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;
import org.junit.jupiter.api.Test;

/**
 * Reading data CSV (RFC 4180) into tables, and data errors end to end: each names the file, the
 * line of the row and the column number of the cell.
 */
class CsvDataTest {

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
        CsvData.parse("a.csv", "\uFEFFx,\"label, quoted\"\n1,\"two\nlines\"\n\n3, four \n");
    assertEquals(List.of("x", "label, quoted"), table.header());
    assertEquals(2, table.rows().size());
    assertEquals(2, table.rows().get(0).line());
    assertEquals(List.of("1", "two\nlines"), table.rows().get(0).cells());
    // The quoted newline and the blank line are counted: the third record starts on line 5.
    assertEquals(5, table.rows().get(1).line());
    assertEquals(List.of("3", "four"), table.rows().get(1).cells());
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
