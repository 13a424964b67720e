package org.hullbound.model;

import static org.hullbound.model.TestModels.table;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.hullbound.lang.ModelException;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourcePosition;
import org.junit.jupiter.api.Test;

/**
 * Data as real files hold it: scalars in a one-row file of scalars, a scalar given no value, and
 * empty cells of modelled columns imputed or refused.
 */
class DataInputTest {

  /** The fault binding {@code model} to {@code tables} fails with. */
  private static ModelException refused(String model, DataTable... tables) {
    return assertThrows(ModelException.class, () -> TestModels.bind(model, tables));
  }

  private static final String SCALAR_MODEL =
      String.join(
          "\n",
          "data n, centre",
          "index t = 1 .. n",
          "data y[t] ~ normal(mean = mu, sd = 1)",
          "param mu ~ normal(mean = centre, sd = 10)");

  @Test
  void aScalarComesFromAOneRowFileOfScalarsAndMaySizeASet() {
    BoundModel model =
        TestModels.bind(
            SCALAR_MODEL,
            table("scalars.csv", "n,centre", "3,-2.5"),
            table("obs.csv", "y", "1.5", "0.5", "2"));
    assertEquals(3, model.indexSets().get(0).size(), "t = 1 .. n with n = 3 from the file");
    // The prior's location is known, so the starting value is it (BoundModel.initialState).
    assertEquals(-2.5, model.initialState()[0], 0.0);
    DataSummary scalars = model.data().get(0);
    assertEquals(
        new DataSummary("scalars.csv", DataSummary.SCALARS, 1, List.of("n", "centre"), 0),
        scalars);
  }

  @Test
  void aModelledScalarMissingInItsFileIsImputed() {
    BoundModel model =
        TestModels.bind(
            "data k ~ poisson(rate = lambda)\nparam lambda ~ gamma(shape = 2, rate = 1)",
            table("k.csv", "k", "NA"));
    assertEquals(2, model.unknowns().size());
    assertTrue(model.unknown("k").imputed());
  }

  @Test
  void aScalarWithoutAValueIsAPositionedErrorNotAnInternalOne() {
    ModelException e =
        refused(
            "index t\ndata  n\ndata y[t] ~ normal(mean = mu, sd = n)\n"
                + "param mu ~ normal(mean = 0, sd = 1)",
            table("obs.csv", "y", "1", "2"));
    assertEquals(new SourcePosition("test.hbm", 2, 7), e.position());
    assertTrue(e.problem().contains("no value for the scalar data 'n': no data file has a column"
        + " 'n'"), e.problem());
    assertTrue(e.hint().contains("data n = 5"), e.hint());
  }

  @Test
  void aScalarWithoutAValueUsedAsABoundIsTheSameError() {
    ModelException e =
        assertThrows(
            ModelException.class,
            () -> BoundModel.bind(
                Parser.parse("test.hbm", "data n\nindex t = 1 .. n\nparam mu[t] ~ normal(mean ="
                    + " 0, sd = 1)"),
                List.of()));
    assertEquals(new SourcePosition("test.hbm", 1, 6), e.position());
    assertTrue(e.problem().contains("no data file was given"), e.problem());
  }

  @Test
  void aFileOfScalarsHasOneRow() {
    ModelException e =
        refused(SCALAR_MODEL, table("scalars.csv", "centre,n", "1,3", "2,3"));
    assertEquals(new SourcePosition("scalars.csv", 1, 1), e.position());
    assertTrue(e.problem().contains("scalars.csv has 2"), e.problem());
  }

  @Test
  void aScalarDoesNotShareAFileWithAVector() {
    ModelException e =
        refused(
            "data y[t] ~ normal(mean = mu, sd = s)\nindex t\ndata s\n"
                + "param mu ~ normal(mean = 0, sd = 1)",
            table("obs.csv", "y,s", "1,2"));
    assertEquals(new SourcePosition("obs.csv", 1, 2), e.position());
    assertTrue(e.problem().contains("'s' is a scalar but column 'y' of the same file runs over"
        + " 't'"), e.problem());
  }

  private static final String COUNTS =
      "index day\ndata count[day] ~ poisson(rate = lambda)\n"
          + "param lambda ~ gamma(shape = 2, rate = 1)";

  @Test
  void emptyAndNaCellsOfAModelledColumnAreImputedByDefault() {
    BoundModel model =
        TestModels.bind(COUNTS, table("days.csv", "count", "3", "", "NA", "4"));
    assertEquals(List.of("lambda", "count[2]", "count[3]"),
        model.unknowns().stream().map(Unknown::label).toList());
  }

  @Test
  void refusedEmptyCellsNameTheFirstOneButNaIsStillImputed() {
    DataTable days = table("days.csv", "count", "3", "NA", "", "4", "");
    ModelException e =
        assertThrows(
            ModelException.class,
            () -> BoundModel.bind(Parser.parse("test.hbm", COUNTS), List.of(days),
                EmptyCells.REFUSED));
    // Header on line 1, so row 3 (the first empty cell) is line 4, column 1.
    assertEquals(new SourcePosition("days.csv", 4, 1), e.position());
    assertTrue(e.problem().contains("empty cell in column 'count' for 'count[3]'"), e.problem());
    BoundModel withNa =
        BoundModel.bind(Parser.parse("test.hbm", COUNTS),
            List.of(table("days.csv", "count", "3", "NA", "4")), EmptyCells.REFUSED);
    assertTrue(withNa.unknown("count[2]").imputed());
  }

  @Test
  void aHeaderCellHoldingAnotherSeparatorSaysSo() {
    ModelException e =
        refused(COUNTS, table("days.csv", "count,day;weekday", "3,1;2"));
    assertEquals(new SourcePosition("days.csv", 1, 2), e.position());
    assertTrue(e.hint().contains("the header cell holds ';': hullbound reads comma-separated"),
        e.hint());
  }

  @Test
  void aCellHoldingAnotherSeparatorSaysSo() {
    ModelException e =
        refused(COUNTS, table("days.csv", "count", "3", "4;5"));
    assertEquals(new SourcePosition("days.csv", 3, 1), e.position());
    assertTrue(e.hint().contains("the cell holds ';': hullbound reads comma-separated files"),
        e.hint());
  }
}
