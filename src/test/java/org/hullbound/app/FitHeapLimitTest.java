package org.hullbound.app;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.BufferedWriter;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.SplittableRandom;
import org.hullbound.gibbs.RunSettings;
import org.hullbound.io.CsvData;
import org.hullbound.io.LimitedHeapChild;
import org.hullbound.lang.ModelFile;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A fit of many rows of few linear predictors runs within a small, fixed heap (issue 14: {@code
 * fit} of the 23-million-row clinics file in the default heap): what it holds per row once its
 * conditionals and lines are compiled is about what {@code check} holds.
 *
 * <p>Measured as pass or fail of a child JVM with a hard heap limit, as {@code
 * io.CsvDataHeapTest} does for reading: the clinics model on {@value #ROWS} rows (36 clinics, 31
 * doses: 1,116 linear predictors), one chain of 2 + 4 sweeps, in 40 MB. This build needs about 28
 * MB (the bound model about 48 bytes a row, binding's and compiling's transient needs on top).
 * Main at 0b8c0ec ran out of 40 MB (and of 160 MB at 200,000 rows, 800 bytes a row): its
 * conditionals and lines kept a row of columns per term (36 bytes a row and used column, {@code
 * model.FitHeap}), a rescaling line copied its moved terms into a list (a term per row) while it
 * compiled, and the starting values' prior simulation made and compiled every observed row's
 * term.
 */
class FitHeapLimitTest {
  private static final int ROWS = 100_000;
  private static final String HEAP = "-Xmx40m";

  private static final String MODEL = String.join("\n",
      "model clinics",
      "index clinic = 1 .. 36",
      "index patient",
      "data  clinic_of[patient], dose[patient]",
      "let   eta[patient] = intercept + slope * dose[patient] + effect[clinic_of[patient]]",
      "data  recovered[patient] ~ bernoulli(logit_p = eta[patient])",
      "param intercept ~ normal(mean = 0, sd = 2)",
      "param slope ~ normal(mean = 0, sd = 1)",
      "param spread ~ half-normal(sd = 1)",
      "param effect[clinic] ~ normal(mean = 0, sd = spread)",
      "");

  @TempDir Path folder;

  @Test
  void fitsAHundredThousandRowsInAFortyMegabyteHeap() throws Exception {
    Path file = folder.resolve("clinics.csv");
    write(file);
    LimitedHeapChild.Result child = LimitedHeapChild.run(
        HEAP, folder.resolve("child.txt"), 300, Child.class, file.toString());
    assertEquals(0, child.exitValue(), child.printed());
    assertEquals("fitted " + ROWS + " rows: 39 unknowns, 4 draws each, all finite",
        child.printed());
  }

  /** Writes clinics-like rows (the layout of {@code io.LargeClinicsFile}) with a fixed seed. */
  private static void write(Path file) throws IOException {
    SplittableRandom random = new SplittableRandom(14);
    try (BufferedWriter out = Files.newBufferedWriter(file)) {
      out.write("clinic_of,dose,recovered\n");
      for (int r = 0; r < ROWS; r++) {
        int clinic = 1 + random.nextInt(36);
        int doseTenths = random.nextInt(31);
        double logit = -0.3 + 0.09 * doseTenths + 0.7 * Math.sin(clinic);
        int recovered = random.nextDouble() < 1 / (1 + Math.exp(-logit)) ? 1 : 0;
        out.write(clinic + "," + doseTenths / 10 + "." + doseTenths % 10 + "," + recovered + "\n");
      }
    }
  }

  /** Binds the model to the file given as its argument, fits one short chain, says what it drew. */
  static final class Child {
    public static void main(String[] args) throws IOException {
      ModelFile model = Parser.parse(SourceText.of("clinics.hbm", MODEL));
      DataTable table = CsvData.read(Path.of(args[0]), BoundModel.readsColumn(model));
      BoundModel bound = BoundModel.bind(model, List.of(table));
      table = null;
      InMemoryFit fit = InMemoryFit.of(bound, RunSettings.of(1, 2, 4, 1, 14L));
      int finite = 0;
      for (int i = 0; i < fit.unknownCount(); i++) {
        for (double[] chain : fit.draws(i)) {
          for (double v : chain) {
            finite += Double.isFinite(v) ? 1 : 0;
          }
        }
      }
      System.out.println("fitted " + bound.data().get(0).rows() + " rows: " + fit.unknownCount()
          + " unknowns, " + finite / fit.unknownCount() + " draws each, all "
          + (finite % fit.unknownCount() == 0 ? "finite" : "not finite"));
    }
  }
}
