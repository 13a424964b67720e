package org.hullbound.gibbs;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;

/**
 * The {@code clinics} demo grown to 3,600 clinics and 120,000 patients (issue 12's sweep benchmark):
 * the model of {@code models/clinics.hbm} with {@code index clinic = 1 .. 3600}, and data of the
 * same invented scenario (doses 0-3 units in tenths, recovery with intercept -0.3, dose slope 0.9
 * and clinic spread 0.7 on the logit scale; clinics drawn uniformly, so about 33 patients each),
 * generated with a fixed seed: the same model and data every time.
 *
 * <p>{@code java -cp target/benchmarks.jar org.hullbound.gibbs.GrownClinics FOLDER} writes {@code
 * clinics_grown.hbm} and {@code clinics_grown.csv} there, for {@code hullbound check} or {@code
 * fit}; the benchmark binds them in memory ({@link #load}).
 */
public final class GrownClinics {
  static final int CLINICS = 3_600;
  static final int PATIENTS = 120_000;
  private static final long SEED = 20261202L;

  private GrownClinics() {}

  /** The model text: the demo's, over 3,600 clinics. */
  static String model() throws IOException {
    Path folder = Path.of(System.getProperty("hullbound.models", "models"));
    String demo = Files.readString(folder.resolve("clinics.hbm"), StandardCharsets.UTF_8);
    String grown = demo.replace("model clinics", "model clinics_grown")
        .replace("index clinic = 1 .. 36", "index clinic = 1 .. " + CLINICS);
    if (grown.equals(demo) || !grown.contains("1 .. " + CLINICS)) {
      throw new IllegalStateException("models/clinics.hbm no longer declares 36 clinics");
    }
    return grown;
  }

  /** The data rows: clinic, dose, recovered, one a patient. */
  static List<List<String>> rows() {
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(SEED);
    double[] effect = new double[CLINICS];
    for (int c = 0; c < CLINICS; c++) {
      effect[c] = 0.7 * random.nextGaussian();
    }
    List<List<String>> rows = new ArrayList<>(PATIENTS);
    for (int patient = 0; patient < PATIENTS; patient++) {
      int clinic = random.nextInt(CLINICS);
      int doseTenths = random.nextInt(31);
      double logit = -0.3 + 0.09 * doseTenths + effect[clinic];
      int recovered = random.nextDouble() < 1 / (1 + Math.exp(-logit)) ? 1 : 0;
      rows.add(List.of(Integer.toString(clinic + 1), doseTenths / 10 + "." + doseTenths % 10,
          Integer.toString(recovered)));
    }
    return rows;
  }

  /** The grown model bound to its data. */
  static BoundModel load() throws IOException {
    return load(data());
  }

  /** The grown model bound to {@code data} (the table of {@link #data}). */
  static BoundModel load(DataTable data) throws IOException {
    return BoundModel.bind(Parser.parse(SourceText.of("clinics_grown.hbm", model())),
        List.of(data));
  }

  /** The data rows as a table. */
  static DataTable data() {
    return DataTable.of("clinics_grown.csv", List.of("clinic_of", "dose", "recovered"), rows());
  }

  public static void main(String[] args) throws IOException {
    if (args.length != 1) {
      System.err.println("usage: GrownClinics FOLDER");
      System.exit(2);
    }
    Path folder = Path.of(args[0]);
    Files.createDirectories(folder);
    Files.writeString(folder.resolve("clinics_grown.hbm"), model(), StandardCharsets.UTF_8);
    StringBuilder csv = new StringBuilder("clinic_of,dose,recovered\n");
    for (List<String> row : rows()) {
      csv.append(String.join(",", row)).append('\n');
    }
    Files.writeString(folder.resolve("clinics_grown.csv"), csv, StandardCharsets.UTF_8);
    System.out.println(folder.resolve("clinics_grown.hbm") + ", " + folder.resolve(
        "clinics_grown.csv") + ": " + CLINICS + " clinics, " + PATIENTS + " patients");
  }
}
