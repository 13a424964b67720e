package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertDoesNotThrow;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.function.IntFunction;
import org.hullbound.lang.ModelException;
import org.junit.jupiter.api.Test;

/**
 * Binding checks each data row from its statement's formula in numbers, and each element of a
 * let per row from the let's body lowered once (issue 14: no formula is made for a row that has
 * no fault). Every kind of fault such a check could miss is still named as lowering the row
 * names it: the same file, line, column and words. Each case puts one fault in row 4,321 of
 * 5,000 (more rows than a let whose elements lowering caches), so that the rows before it pass
 * the numeric check and only the faulty one is lowered.
 *
 * <p>The expected messages and positions are those binding gave when it lowered every row (main
 * at 0b8c0ec, before the numeric check; this test passed there unchanged), worked out from each
 * file's text: a data cell is at the row's line (row + 1, after the header) and its column; a
 * number folded from several data cells or from the model's own numbers has no cell and is blamed
 * on the model's expression.
 */
class RowChecksTest {

  private static final int ROWS = 5_000;
  private static final int BAD = 4_321;

  /** The clinics demo (models/clinics.hbm): its predictor a let per row. */
  private static final String CLINICS = TermTableTest.CLINICS;

  /** The same with the predictor written in the likelihood: each row's indexes read there. */
  private static final String CLINICS_INLINE = """
      model clinics
      index clinic = 1 .. 4
      index patient
      data  clinic_of[patient], dose[patient]
      data  recovered[patient] ~ bernoulli(logit_p = intercept + slope * dose[patient] + effect[clinic_of[patient]])
      param intercept ~ normal(mean = 0, sd = 2)
      param slope ~ normal(mean = 0, sd = 1)
      param spread ~ half-normal(sd = 1)
      param effect[clinic] ~ normal(mean = 0, sd = spread)
      """;

  /** Arguments and bounds known from the data, some folded from a cell and a number. */
  private static final String KNOWN = """
      model known
      index obs
      data  s[obs], lo[obs], hi[obs], n[obs], a[obs], b[obs]
      data  y[obs] ~ normal(mean = m, sd = s[obs]) within lo[obs] .. hi[obs] + 0.5
      data  k[obs] ~ binomial(trials = n[obs] - 1, p = q)
      data  u[obs] ~ uniform(lower = a[obs], upper = b[obs])
      param m ~ normal(mean = 0, sd = 1)
      param q ~ beta(a = 1, b = 1)
      """;

  private static String clinicsRow(int r) {
    return (r % 4 + 1) + "," + r / 10.0 + "," + r % 2;
  }

  private static String knownRow(int r) {
    // s, lo, hi, n, a, b, y, k, u: y in 0 .. 3.5, k of n - 1 trials, u in a .. b
    return "1.5,0,3," + (r % 5 + 2) + ",-1,2," + r % 3 + "," + r % 2 + ",0.5";
  }

  @Test
  void anIndexOutsideItsSetInALetPerRow() {
    fault(CLINICS, "clinic_of,dose,recovered", RowChecksTest::clinicsRow, "9,0.5,1",
        1, "index value 9 is outside index set 'clinic' (1 .. 4), which indexes 'effect'");
  }

  @Test
  void anIndexNotWholeInALetPerRow() {
    fault(CLINICS, "clinic_of,dose,recovered", RowChecksTest::clinicsRow, "2.5,0.5,1",
        1, "index 2.5 of 'effect' is not a whole number");
  }

  @Test
  void anIndexOutsideItsSetInALetThatNothingReads() {
    // a fault in a let is named even where no statement reads the let
    String model = CLINICS.replace("data  clinic_of[patient], dose[patient]",
        "data  clinic_of[patient], dose[patient], ward_of[patient]\n"
            + "let   ward_effect[patient] = 2 * effect[ward_of[patient]]");
    fault(model, "clinic_of,dose,recovered,ward_of", r -> clinicsRow(r) + "," + (r % 3 + 1),
        "2,0.5,1,7", 4,
        "index value 7 is outside index set 'clinic' (1 .. 4), which indexes 'effect'");
  }

  @Test
  void anIndexOutsideItsSetInAStatement() {
    fault(CLINICS_INLINE, "clinic_of,dose,recovered", RowChecksTest::clinicsRow, "0,0.5,1",
        1, "index value 0 is outside index set 'clinic' (1 .. 4), which indexes 'effect'");
  }

  @Test
  void anIndexNotWholeInAStatement() {
    fault(CLINICS_INLINE, "clinic_of,dose,recovered", RowChecksTest::clinicsRow, "3.25,0.5,1",
        1, "index 3.25 of 'effect' is not a whole number");
  }

  @Test
  void anObservationOutsideTheFamilysSupport() {
    fault(CLINICS, "clinic_of,dose,recovered", RowChecksTest::clinicsRow, "2,0.5,2",
        3, "'recovered[4321]' = 2 is not a valid value of bernoulli: it must be 0 or 1");
  }

  @Test
  void aKnownArgumentOutsideItsRangeFromACell() {
    fault(KNOWN, "s,lo,hi,n,a,b,y,k,u", RowChecksTest::knownRow, "-1,0,3,4,-1,2,1,1,0.5",
        1, "invalid arguments of normal for 'y[4321]': sd must be > 0");
  }

  @Test
  void aKnownArgumentOutsideItsRangeFoldedFromACellAndANumber() {
    faultInModel(KNOWN, "s,lo,hi,n,a,b,y,k,u", RowChecksTest::knownRow, "1.5,0,3,0,-1,2,1,0,0.5",
        5, 41, "invalid arguments of binomial for 'k[4321]': trials must be a whole number >= 0,"
            + " got -1");
  }

  @Test
  void aCountAboveItsKnownTrials() {
    fault(KNOWN, "s,lo,hi,n,a,b,y,k,u", RowChecksTest::knownRow, "1.5,0,3,4,-1,2,1,4,0.5",
        8, "'k[4321]' = 4 is not a valid value of binomial: it exceeds trials = 3");
  }

  @Test
  void anEmptyTruncationFromTheData() {
    // y missing there (imputed), so that no observed value outside the bounds names the row first
    faultInModel(KNOWN, "s,lo,hi,n,a,b,y,k,u", RowChecksTest::knownRow, "1.5,2,1,4,-1,2,NA,1,0.5",
        4, 46, "within 2 .. 1.5 is empty; the lower bound must be below the upper");
  }

  @Test
  void anObservationOutsideItsTruncation() {
    fault(KNOWN, "s,lo,hi,n,a,b,y,k,u", RowChecksTest::knownRow, "1.5,0,3,4,-1,2,3.75,1,0.5",
        7, "'y[4321]' = 3.75 is not a valid value of normal: it lies outside within 0 .. 3.5");
  }

  @Test
  void knownArgumentsThatDoNotFitTogether() {
    // u missing there (imputed), so that no observed value outside them names the row first
    faultInModel(KNOWN, "s,lo,hi,n,a,b,y,k,u", RowChecksTest::knownRow, "1.5,0,3,4,2,-1,1,1,NA",
        6, 32, "invalid arguments of uniform for 'u[4321]': lower must be < upper, got lower = 2,"
            + " upper = -1");
  }

  @Test
  void anObservationOutsideBoundsGivenByItsArguments() {
    fault(KNOWN, "s,lo,hi,n,a,b,y,k,u", RowChecksTest::knownRow, "1.5,0,3,4,-1,2,1,1,2.5",
        9, "'u[4321]' = 2.5 is not a valid value of uniform: it must lie between -1 and 2");
  }

  @Test
  void aTruncationBoundThatReadsAnUnknownInOneRowOnly() {
    // cap[2] is missing, so imputed: the rows of group 2 have an unknown upper bound
    String model = """
        model bound
        index grp = 1 .. 3
        index obs
        data  cap[grp] = [5, NA, 7] ~ normal(mean = 6, sd = 1)
        data  g[obs]
        data  y[obs] ~ normal(mean = m, sd = 1) within 0 .. cap[g[obs]]
        param m ~ normal(mean = 0, sd = 1)
        """;
    faultInModel(model, "g,y", r -> (r % 2 == 0 ? 1 : 3) + ",0.5", "2,0.5",
        6, 53, "the upper bound of within must be known (data or a number), not depend on an"
            + " unknown");
  }

  /** Without the fault the same file binds: the fault is the row's, not the model's. */
  @Test
  void theFilesBindWithoutTheirFault() {
    assertDoesNotThrow(() -> TestModels.bind(CLINICS, table("clinic_of,dose,recovered",
        RowChecksTest::clinicsRow, clinicsRow(BAD))));
    assertDoesNotThrow(() -> TestModels.bind(KNOWN, table("s,lo,hi,n,a,b,y,k,u",
        RowChecksTest::knownRow, knownRow(BAD))));
  }

  /** Binding fails at the cell of column {@code column} in the bad row, with {@code words}. */
  private static void fault(String model, String header, IntFunction<String> row, String bad,
      int column, String words) {
    ModelException e = assertThrows(ModelException.class,
        () -> TestModels.bind(model, table(header, row, bad)));
    assertTrue(e.render().contains(words), e.render());
    assertEquals("rows.csv", e.position().file(), e.render());
    assertEquals(BAD + 1, e.position().line(), e.render());
    assertEquals(column, e.position().column(), e.render());
  }

  /** Binding fails at line {@code line}, column {@code column} of the model, with {@code words}. */
  private static void faultInModel(String model, String header, IntFunction<String> row,
      String bad, int line, int column, String words) {
    ModelException e = assertThrows(ModelException.class,
        () -> TestModels.bind(model, table(header, row, bad)));
    assertTrue(e.render().contains(words), e.render());
    assertEquals("test.hbm", e.position().file(), e.render());
    assertEquals(line, e.position().line(), e.render());
    assertEquals(column, e.position().column(), e.render());
  }

  /** {@link #ROWS} rows made by {@code row}, row {@link #BAD} replaced by {@code bad}. */
  private static DataTable table(String header, IntFunction<String> row, String bad) {
    List<String> lines = new ArrayList<>(List.of(header));
    for (int r = 1; r <= ROWS; r++) {
      lines.add(r == BAD ? bad : row.apply(r));
    }
    return TestModels.table("rows.csv", lines.toArray(new String[0]));
  }
}
