package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.hullbound.io.CsvData;
import org.hullbound.lang.Parser;
import org.junit.jupiter.api.Test;

/**
 * A row's term made from its statement's formula ({@link StatementFormula}) equals the term
 * lowering that statement for the row makes, which binding checked: on every demo and validation
 * model with its data, and on statements that read lets of every size, sums, truncation bounds,
 * missing cells and indexes through data (docs/data.md, step 1). Equal as records: the same
 * folded formulas, constants with the same cells, the same family, bounds, owner and position.
 */
class StatementFormulaTest {

  @Test
  void everyTermOfTheDemoAndValidationModelsEqualsItsLoweredTerm() throws IOException {
    List<Path> models = new ArrayList<>();
    try (Stream<Path> files = Files.list(Path.of("models"))) {
      files.filter(f -> f.toString().endsWith(".hbm")).sorted().forEach(models::add);
    }
    try (Stream<Path> folders = Files.list(Path.of("validation"))) {
      folders.map(f -> f.resolve("model.hbm")).filter(Files::exists).sorted().forEach(models::add);
    }
    int compared = 0;
    for (Path model : models) {
      compared += compareAll(model.toString(), Files.readString(model), dataOf(model));
    }
    assertTrue(models.size() >= 20, models.toString());
    assertTrue(compared > 2_000, "terms compared: " + compared);
  }

  @Test
  void letsSumsBoundsAndMissingCellsAreMadeAsLoweringMakesThem() {
    String model = """
        model shapes
        index group = 1 .. 3
        index k = 1 .. 2
        index row
        data  group_of[row], x[row], w[row, k]
        let   base[group] = centre + offset[group]
        let   mean[row] = base[group_of[row]] + slope * x[row] + sum(k: beta[k] * w[row, k])
        data  y[row] ~ normal(mean = mean[row], sd = spread) within -50 .. x[row] + 40
        data  count[row] ~ poisson(log_rate = max(beta[1], beta[2]) - abs(x[row]) / 10)
        param centre ~ normal(mean = 0, sd = 2)
        param offset[group] ~ normal(mean = 0, sd = 1)
        param slope ~ normal(mean = 0, sd = 1)
        param beta[k] ~ normal(mean = 0, sd = 1)
        param spread ~ half-normal(sd = 1)
        """;
    List<String> lines = new ArrayList<>(List.of("group_of,x,w[1],w[2],y,count"));
    for (int r = 1; r <= 5_000; r++) {
      // every 7th y and every 11th count missing (imputed), negative and fractional x
      lines.add((r % 3 + 1) + "," + (r % 13 - 6) * 0.5 + "," + r % 5 + "," + (r % 2) * 1.5 + ","
          + (r % 7 == 0 ? "NA" : String.valueOf(r % 9 - 4)) + "," + (r % 11 == 0 ? "" : r % 4));
    }
    BoundModel bound = BoundModel.bind(Parser.parse("shapes", model),
        List.of(TestModels.table("shapes.csv", lines.toArray(new String[0]))));
    TermTable terms = (TermTable) bound.terms();
    long before = terms.rowLowerings();
    for (int i = 0; i < terms.size(); i++) {
      terms.get(i);
    }
    // every row's term made from its statement's formula, none lowered for its row
    assertEquals(before, terms.rowLowerings());
    compareAll("shapes", model, List.of(TestModels.table("shapes.csv",
        lines.toArray(new String[0]))));
  }

  /** Compares every term of {@code model} bound to {@code data}; the count compared. */
  private static int compareAll(String name, String model, List<DataTable> data) {
    BoundModel bound = BoundModel.bind(Parser.parse(name, model), data);
    TermTable terms = (TermTable) bound.terms();
    for (int i = 0; i < terms.size(); i++) {
      assertEquals(terms.lowered(i), terms.get(i), name + ", term " + i);
    }
    assertDependentsReadFromTheTerms(name, bound);
    return terms.size();
  }

  /**
   * Binding gathers each unknown's dependents and own term while it checks the rows, from the
   * statements' formulas in numbers where it can (no term made): they are those the terms say,
   * each term listed once under every slot its value or arguments read but its owner.
   */
  private static void assertDependentsReadFromTheTerms(String name, BoundModel bound) {
    MovePatterns.Facts facts = bound.facts();
    List<Term> terms = bound.terms();
    int slots = facts.dependents().length;
    List<List<Integer>> expected = new ArrayList<>();
    int[] own = new int[slots];
    java.util.Arrays.fill(own, -1);
    for (int s = 0; s < slots; s++) {
      expected.add(new ArrayList<>());
    }
    for (int t = 0; t < terms.size(); t++) {
      Term term = terms.get(t);
      java.util.Set<Integer> read = new java.util.TreeSet<>();
      term.value().collectSlots(read);
      term.arguments().forEach(a -> a.collectSlots(read));
      for (int s : read) {
        if (s != term.owner()) {
          expected.get(s).add(t);
        }
      }
      if (term.owner() >= 0) {
        own[term.owner()] = t;
      }
    }
    for (int s = 0; s < slots; s++) {
      assertEquals(expected.get(s),
          java.util.Arrays.stream(facts.dependents()[s]).boxed().toList(), name + ", slot " + s);
    }
    assertEquals(java.util.Arrays.toString(own), java.util.Arrays.toString(facts.ownTerm()), name);
  }

  private static List<DataTable> dataOf(Path model) throws IOException {
    List<DataTable> tables = new ArrayList<>();
    String base = model.getFileName().toString().replace(".hbm", "");
    if (model.getParent().getFileName().toString().equals("models")) {
      // the demos' data files as DemoModelsFitTest lists them
      List<String> names = switch (base) {
        case "fill_weights" -> List.of("bottles.csv", "shifts.csv");
        default -> Files.exists(model.resolveSibling(base + ".csv")) ? List.of(base + ".csv")
            : List.of();
      };
      for (String n : names) {
        tables.add(CsvData.read(model.resolveSibling(n)));
      }
      return tables;
    }
    try (Stream<Path> files = Files.list(model.getParent())) {
      for (Path f : files.sorted().toList()) {
        if (f.toString().endsWith(".csv") && !f.getFileName().toString().equals("reference.csv")) {
          tables.add(CsvData.read(f));
        }
      }
    }
    return tables;
  }
}
