package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.hullbound.lang.Parser;
import org.junit.jupiter.api.Test;

/**
 * The analyses answer a row from its statement's formula where they can ({@link
 * StatementFormula}: concavity on the natural scale, conjugacy's truncation check, the rows a
 * shift leaves unchanged, the unknowns a direction block joins), and must answer exactly as they
 * do term by term (docs/data.md, step 3). Each update is chosen twice here: from the model's
 * blanket, whose rows can name their statement, and from the same terms copied into a plain list,
 * which the analyses read one term at a time; the reasons must be the same words. The models
 * reach each branch: rows where the unknown enters two arguments, a truncated statement, a data
 * factor on a shifted unknown's way, a coefficient of -1, lets inlined.
 */
class StatementAnswersTest {

  private static final String[] MODELS = {
    // a random intercept per group: a shift of intercept against the effects, a direction block
    """
    model groups
    index g = 1 .. 4
    index row
    data  g_of[row], x[row]
    let   eta[row] = intercept + slope * x[row] + effect[g_of[row]]
    data  y[row] ~ bernoulli(logit_p = eta[row])
    param intercept ~ normal(mean = 0, sd = 2)
    param slope ~ normal(mean = 0, sd = 1)
    param spread ~ half-normal(sd = 1)
    param effect[g] ~ normal(mean = 0, sd = spread)
    """,
    // the effect with a data factor on its way (no shift), an unknown in two arguments
    """
    model factors
    index g = 1 .. 3
    index row
    data  g_of[row], x[row]
    data  y[row] ~ normal(mean = intercept + x[row] * effect[g_of[row]], sd = sigma + effect[g_of[row]] - effect[g_of[row]] + 1)
    param intercept ~ normal(mean = 0, sd = 2)
    param sigma ~ half-normal(sd = 1)
    param effect[g] ~ normal(mean = 0, sd = 1)
    """,
    // truncated rows; an effect entering with -1; a normal mean that is conjugate when not truncated
    """
    model truncated
    index g = 1 .. 3
    index row
    data  g_of[row], x[row]
    data  y[row] ~ normal(mean = intercept - effect[g_of[row]], sd = 1) within -20 .. 20
    data  z[row] ~ poisson(log_rate = centre + x[row] / 4)
    param intercept ~ normal(mean = 0, sd = 2)
    param centre ~ normal(mean = 0, sd = 2)
    param effect[g] ~ normal(mean = 0, sd = 1)
    """,
    // truncated rows whose every argument reads a param (so the statement answers for them)
    """
    model truncated_spread
    index g = 1 .. 3
    index row
    data  g_of[row]
    data  y[row] ~ normal(mean = intercept + effect[g_of[row]], sd = sigma) within -20 .. 20
    param intercept ~ normal(mean = 0, sd = 2)
    param sigma ~ half-normal(sd = 1)
    param effect[g] ~ normal(mean = 0, sd = 1)
    """,
    // the same unknown twice in one row (g_of = h_of on some rows), a non-affine link
    """
    model twice
    index g = 1 .. 3
    index row
    data  g_of[row], h_of[row], x[row]
    data  y[row] ~ normal(mean = effect[g_of[row]] + effect[h_of[row]], sd = 1)
    data  c[row] ~ poisson(rate = exp(effect[g_of[row]]) + x[row] * x[row])
    param effect[g] ~ normal(mean = 0, sd = 1)
    """,
  };

  /**
   * More rows than a let may have and still be cached ({@link ModelLowering#LARGEST_HELD_LET}):
   * a let per row is then part of its statement's formula, as on a large file.
   */
  private static final int ROWS = ModelLowering.LARGEST_HELD_LET + 100;

  @Test
  void everyUpdateIsChosenAsFromItsTermsOneByOne() {
    for (String text : MODELS) {
      BoundModel model = BoundModel.bind(Parser.parse("m.hbm", text), List.of(data(text)));
      for (Unknown u : model.unknowns()) {
        int s = u.index();
        Term own = model.ownTerm(s);
        List<Term> rows = model.dependents(s);
        assertTrue(rows instanceof TermTable.Rows, "the blanket can name its statements");
        List<Term> plain = new ArrayList<>(rows);
        Formula[] support = BoundModel.support(own);
        double lower = support[0] instanceof Formula.Constant c ? c.value() : Double.NaN;
        double upper = support[1] instanceof Formula.Constant c ? c.value() : Double.NaN;
        ArgumentBounds cuts = ArgumentBounds.of(s, own, plain, lower, upper);
        boolean smooth = UpdateAnalysis.smooth(s, own, plain);
        String expected = UpdateAnalysis.choose(s, own, plain, u.discrete(), u.imputed(), cuts,
            smooth).update().reason();
        String fromStatements = UpdateAnalysis.choose(s, own, rows, u.discrete(), u.imputed(),
            cuts, smooth).update().reason();
        assertEquals(expected, fromStatements, u.label());
        // and as the model chose it, where no block took it over
        if (!(model.update(s) instanceof Update.LinearNormalBlock)) {
          assertEquals(expected, model.update(s).reason(), u.label());
        }
      }
      List<String> moves = model.moves().stream().map(Update::reason).toList();
      MovePatterns.Facts facts = model.facts();
      List<String> termByTerm = MovePatterns.find(new MovePatterns.Facts(
          new ArrayList<>(facts.terms()), facts.ownTerm(), facts.dependents(), facts.unknowns(),
          facts.updates(), facts.cuts(), facts.smooth())).stream().map(Update::reason).toList();
      assertEquals(termByTerm, moves);
    }
  }

  /**
   * {@link #ROWS} rows of the columns {@code model} reads: groups 1, 2, 3 in turn, h_of the same as g_of on
   * every third row, x from -1.5 to 1.5, y 0/1 (and within -20 .. 20), z and c counts.
   */
  private static DataTable data(String model) {
    List<String> columns = new ArrayList<>();
    for (String name : List.of("g_of", "h_of", "x", "y", "z", "c")) {
      if (model.contains("data  " + name + "[") || model.contains(", " + name + "[")
          || model.contains("data  g_of[row], " + name) || model.contains(name + "[row] ~")) {
        columns.add(name);
      }
    }
    List<String> lines = new ArrayList<>(List.of(String.join(",", columns)));
    for (int r = 1; r <= ROWS; r++) {
      List<String> cells = new ArrayList<>();
      for (String name : columns) {
        cells.add(switch (name) {
          case "g_of" -> String.valueOf(r % 3 + 1);
          case "h_of" -> String.valueOf(r % 3 == 0 ? r % 3 + 1 : (r + 1) % 3 + 1);
          case "x" -> String.valueOf((r % 7 - 3) * 0.5);
          case "y" -> String.valueOf(r % 2);
          case "z" -> String.valueOf(r % 5);
          default -> String.valueOf(r % 4);
        });
      }
      lines.add(String.join(",", cells));
    }
    return TestModels.table("d.csv", lines.toArray(new String[0]));
  }
}
