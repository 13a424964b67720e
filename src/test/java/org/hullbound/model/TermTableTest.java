package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * What a bound model holds per data row (issue 14: at most 100 bytes of heap per row per used
 * column while {@code check} runs, so that a file of 23 million rows fits the default heap).
 *
 * <p>Counted, not timed or weighed: the {@link Term} objects reachable from the model and its
 * test quantities after every analysis {@code check} prints, found by walking its fields. A term per row would make
 * the count grow with the rows; the data rows' terms are made when asked ({@link TermTable}), so
 * only the priors are held.
 */
class TermTableTest {

  /** The clinics demo's model (models/clinics.hbm), with its analyses and moves. */
  static final String CLINICS = """
      model clinics
      index clinic = 1 .. 4
      index patient
      data  clinic_of[patient], dose[patient]
      let   eta[patient] = intercept + slope * dose[patient] + effect[clinic_of[patient]]
      data  recovered[patient] ~ bernoulli(logit_p = eta[patient])
      param intercept ~ normal(mean = 0, sd = 2)
      param slope ~ normal(mean = 0, sd = 1)
      param spread ~ half-normal(sd = 1)
      param effect[clinic] ~ normal(mean = 0, sd = spread)
      """;

  @Test
  void aModelHoldsItsPriorsButNoTermPerDataRow() {
    for (int rows : new int[] {500, 5_000}) {
      BoundModel model = TestModels.bind(CLINICS, rows(rows));
      for (Unknown u : model.unknowns()) {
        model.update(u.index());
        model.dependentCount(u.index());
      }
      model.moves();
      TestQuantities tests = TestQuantities.of(model);
      // 3 scalar priors and 4 effects' priors, and the 5 priors that the shift of intercept
      // against the effects moves (held by its line), whatever the rows
      assertEquals(12, reachable(new Object[] {model, tests}, Term.class), rows + " rows");
      assertEquals(rows + 7, model.termCount(), rows + " rows");
    }
  }

  /**
   * {@code check}'s analyses (every unknown's update, the dependents' counts, the moves, the test
   * quantities) lower no statement for a row once binding is over: a row's term is made from its
   * statement's formula ({@link StatementFormula}), or not at all where the statement answers
   * for every row. Before, each row's term was lowered again at every read, about 19 times a row
   * for clinics. Counted, not timed: the lowerings for one row ({@link TermTable#rowLowerings}),
   * which binding no longer makes either (below).
   */
  @Test
  void checksAnalysesLowerNoStatementForARow() {
    for (int rows : new int[] {500, 5_000}) {
      BoundModel model = TestModels.bind(CLINICS, rows(rows));
      TermTable terms = (TermTable) model.terms();
      assertEquals(0, terms.rowLowerings(), rows + " rows");
      for (Unknown u : model.unknowns()) {
        model.update(u.index());
        model.dependentCount(u.index());
        model.dynamicBlanket(u.index());
        model.allocation(u.index());
      }
      model.moves();
      TestQuantities.of(model);
      assertEquals(0, terms.rowLowerings(), rows + " rows, after the analyses");
    }
  }

  /**
   * Binding checks each row of a statement from its statement's formula in numbers, and each
   * element of a let per row from the let's body lowered once ({@link LetBinding}): no statement
   * is lowered for a row and no let element on its own, where before binding lowered each term
   * once (5,007 at 5,000 rows) and each element of {@code eta} once (5,000). Counted, not timed
   * ({@link TermTable#rowLowerings}, {@link TermTable#letLowerings}). At 500 rows {@code eta} is
   * a let of few elements, which lowering caches for every formula that reads it: each element is
   * lowered once, then, and read from there.
   */
  @Test
  void bindingLowersNoRowAndNoElementOfALetPerRow() {
    TermTable terms = (TermTable) TestModels.bind(CLINICS, rows(5_000)).terms();
    assertEquals(0, terms.rowLowerings());
    assertEquals(0, terms.letLowerings());
    TermTable few = (TermTable) TestModels.bind(CLINICS, rows(500)).terms();
    assertEquals(0, few.rowLowerings());
    assertEquals(500, few.letLowerings());
  }

  @Test
  void aTermMadeAgainEqualsTheOneBindingChecked() {
    BoundModel model = TestModels.bind(CLINICS, rows(50));
    List<Term> terms = model.terms();
    Term first = terms.get(0);
    // made anew on every call, from the same statement and row
    assertEquals(first, terms.get(0));
    assertEquals("recovered[1]", first.label());
    assertEquals("bernoulli", first.familyName());
    assertEquals(-1, first.owner());
    Term prior = terms.get(50);
    assertEquals(prior, terms.get(50));
    assertEquals("intercept", prior.label());
  }

  @Test
  void aTermOfARowReadsThatRowsData() {
    BoundModel model = TestModels.bind(CLINICS, rows(50));
    // row 8: dose 8 / 10, clinic 8 % 4 + 1 = 1; the logit is intercept + slope * dose + effect[1]
    Term row = model.terms().get(7);
    double[] state = model.initialState();
    int intercept = model.unknown("intercept").index();
    int slope = model.unknown("slope").index();
    int effect = model.unknown("effect[1]").index();
    state[intercept] = 0.25;
    state[slope] = -1.5;
    state[effect] = 0.75;
    double logit = Evaluator.compile(row.argument("logit_p"), -1).eval(new Frame(Double.NaN, state));
    assertEquals(0.25 - 1.5 * 0.8 + 0.75, logit, 1e-12);
  }

  /** Rows of clinics data: clinic k % 4 + 1, dose k / 10, recovered k % 2. */
  static DataTable rows(int count) {
    String[] lines = new String[count + 1];
    lines[0] = "clinic_of,dose,recovered";
    for (int k = 1; k <= count; k++) {
      lines[k] = (k % 4 + 1) + "," + (k / 10.0) + "," + (k % 2);
    }
    return TestModels.table("rows.csv", lines);
  }

  /** How many instances of {@code type} are reachable from {@code root} ({@link ReachableObjects}). */
  private static int reachable(Object root, Class<?> type) {
    return ReachableObjects.count(root, type::isInstance, true, o -> false, ReachableObjects.seen());
  }
}
