package org.hullbound.io;

import java.io.BufferedWriter;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;

/**
 * Writes the data of {@code models/clinics.hbm} scaled up to any number of patients: the same
 * invented scenario as {@code models/clinics.csv} (36 clinics, doses 0-3 units, recovery with
 * intercept -0.3, dose slope 0.9 and clinic spread 0.7 on the logit scale), about 8.7 bytes a row,
 * so 2.3 million rows make 20 MB and 23 million make 200 MB. Fixed seed: the same file every time.
 *
 * <p>{@code java -cp target/benchmarks.jar org.hullbound.io.LargeClinicsFile ROWS FILE}
 */
public final class LargeClinicsFile {
  private LargeClinicsFile() {}

  /** Writes {@code rows} patients to {@code file}. */
  public static void write(Path file, long rows) throws IOException {
    RandomGenerator random = RandomGeneratorFactory.of("L64X128MixRandom").create(20261202L);
    double[] effect = new double[36];
    for (int c = 0; c < 36; c++) {
      effect[c] = 0.7 * random.nextGaussian();
    }
    try (BufferedWriter out = Files.newBufferedWriter(file)) {
      out.write("clinic_of,dose,recovered\n");
      StringBuilder line = new StringBuilder();
      for (long patient = 0; patient < rows; patient++) {
        int clinic = random.nextInt(36);
        int doseTenths = random.nextInt(31);
        double logit = -0.3 + 0.09 * doseTenths + effect[clinic];
        int recovered = random.nextDouble() < 1 / (1 + Math.exp(-logit)) ? 1 : 0;
        line.setLength(0);
        line.append(clinic + 1).append(',').append(doseTenths / 10).append('.')
            .append(doseTenths % 10).append(',').append(recovered).append('\n');
        out.append(line);
      }
    }
  }

  public static void main(String[] args) throws IOException {
    if (args.length != 2) {
      System.err.println("usage: LargeClinicsFile ROWS FILE");
      System.exit(2);
    }
    Path file = Path.of(args[1]);
    write(file, Long.parseLong(args[0]));
    System.out.println(file + ": " + args[0] + " rows, " + Files.size(file) + " bytes");
  }
}
