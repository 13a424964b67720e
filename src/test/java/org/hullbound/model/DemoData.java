package org.hullbound.model;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import java.util.random.RandomGenerator;
import java.util.random.RandomGeneratorFactory;

/**
 * Generates the invented data of the demo models under {@code models/}, with fixed seeds, so that
 * every bundled data file can be rebuilt and checked ({@code DemoDataTest}).
 *
 * <p>Run {@code main} from the project root to rewrite the files. All scenarios and values are
 * invented; the "true" values used below are stated in each generator.
 */
public final class DemoData {

  private DemoData() {}

  /** File name (relative to {@code models/}) to its contents. */
  public static Map<String, String> files() {
    Map<String, String> files = new TreeMap<>();
    files.put("seedlings.csv", seedlings());
    files.put("clinics.csv", clinics());
    files.put("bottles.csv", bottles());
    files.put("shifts.csv", shifts());
    files.put("sensors.csv", sensors());
    files.put("orchard.csv", orchard());
    files.put("extract.csv", extract());
    files.put("mussels.csv", mussels());
    return files;
  }

  public static void main(String[] args) throws IOException {
    for (Map.Entry<String, String> file : files().entrySet()) {
      Files.writeString(Path.of("models", file.getKey()), file.getValue(), StandardCharsets.UTF_8);
    }
  }

  private static RandomGenerator random(long seed) {
    return RandomGeneratorFactory.of("L64X128MixRandom").create(seed);
  }

  private static double inverseLogit(double a) {
    return 1 / (1 + Math.exp(-a));
  }

  private static int binomial(RandomGenerator random, int trials, double p) {
    int successes = 0;
    for (int i = 0; i < trials; i++) {
      successes += random.nextDouble() < p ? 1 : 0;
    }
    return successes;
  }

  private static int poisson(RandomGenerator random, double rate) {
    // Knuth's product-of-uniforms method (common practice for small rates).
    double limit = Math.exp(-rate);
    double product = random.nextDouble();
    int count = 0;
    while (product > limit) {
      product *= random.nextDouble();
      count++;
    }
    return count;
  }

  private static String fixed(double v) {
    return String.format(Locale.ROOT, "%.3f", v);
  }

  /** 8 benches of 5 trays; true centre 0.8, spread 0.6 on the logit scale; 20-30 seeds a tray. */
  static String seedlings() {
    RandomGenerator random = random(20240801L);
    double[] effect = new double[8];
    for (int b = 0; b < 8; b++) {
      effect[b] = 0.8 + 0.6 * random.nextGaussian();
    }
    StringBuilder csv = new StringBuilder("planted,bench_of,survived\n");
    for (int tray = 0; tray < 40; tray++) {
      int bench = tray % 8;
      int planted = 20 + random.nextInt(11);
      int survived = binomial(random, planted, inverseLogit(effect[bench]));
      csv.append(planted).append(',').append(bench + 1).append(',').append(survived).append('\n');
    }
    return csv.toString();
  }

  /**
   * 12 concentrations of a plant extract, 4.0 to 6.2 log2 units in steps of 0.2 (far from 0, not
   * centred), 30 nematodes a plate, one plate each; deaths with true intercept -11 and slope 2.2
   * on the logit scale (half die at 5.0).
   */
  static String extract() {
    RandomGenerator random = random(20261202L);
    StringBuilder csv = new StringBuilder("concentration,exposed,dead\n");
    for (int plate = 0; plate < 12; plate++) {
      double concentration = Math.round(40 + 2 * plate) / 10.0;
      int dead = binomial(random, 30, inverseLogit(-11 + 2.2 * concentration));
      csv.append(concentration).append(",30,").append(dead).append('\n');
    }
    return csv.toString();
  }

  /**
   * 120 shell lengths (mm) from two year classes: a share 0.35 young with lengths normal(31, 3.5),
   * the others normal(48, 3.5); one decimal.
   */
  static String mussels() {
    RandomGenerator random = random(20261203L);
    StringBuilder csv = new StringBuilder("length\n");
    for (int shell = 0; shell < 120; shell++) {
      double centre = random.nextDouble() < 0.35 ? 31 : 48;
      double length = centre + 3.5 * random.nextGaussian();
      csv.append(String.format(Locale.ROOT, "%.1f", length)).append('\n');
    }
    return csv.toString();
  }

  /**
   * 36 clinics, 1200 patients; recovery with true intercept -0.3, dose slope 0.9, clinic spread
   * 0.7 on the logit scale; doses 0-3 units.
   */
  static String clinics() {
    RandomGenerator random = random(20240802L);
    double[] effect = new double[36];
    for (int c = 0; c < 36; c++) {
      effect[c] = 0.7 * random.nextGaussian();
    }
    StringBuilder csv = new StringBuilder("clinic_of,dose,recovered\n");
    for (int patient = 0; patient < 1200; patient++) {
      int clinic = random.nextInt(36);
      double dose = Math.round(random.nextDouble() * 30) / 10.0;
      double p = inverseLogit(-0.3 + 0.9 * dose + effect[clinic]);
      int recovered = random.nextDouble() < p ? 1 : 0;
      csv.append(clinic + 1).append(',').append(dose).append(',').append(recovered).append('\n');
    }
    return csv.toString();
  }

  /** 60 bottle weights, true target 502 g and sd 1.5 g; bottles 17 and 44 were not weighed. */
  static String bottles() {
    RandomGenerator random = random(20240803L);
    StringBuilder csv = new StringBuilder("weight\n");
    for (int bottle = 1; bottle <= 60; bottle++) {
      double weight = 502 + 1.5 * random.nextGaussian();
      csv.append(bottle == 17 || bottle == 44 ? "NA" : fixed(weight)).append('\n');
    }
    return csv.toString();
  }

  /** 24 shifts of 6-10 hours; rejected bottles at a true rate of 0.8 an hour. */
  static String shifts() {
    RandomGenerator random = random(20240804L);
    StringBuilder csv = new StringBuilder("hours,rejects\n");
    for (int shift = 0; shift < 24; shift++) {
      int hours = 6 + random.nextInt(5);
      csv.append(hours).append(',').append(poisson(random, 0.8 * hours)).append('\n');
    }
    return csv.toString();
  }

  /** 80 sensor readings over 10 days, level 20, drift 0.3 a day, student-t noise (df 3, 0.5). */
  static String sensors() {
    RandomGenerator random = random(20240805L);
    StringBuilder csv = new StringBuilder("day,reading\n");
    for (int i = 0; i < 80; i++) {
      double day = i / 8.0;
      double chiSquare = 0;
      for (int k = 0; k < 3; k++) {
        double z = random.nextGaussian();
        chiSquare += z * z;
      }
      double t = random.nextGaussian() / Math.sqrt(chiSquare / 3);
      csv.append(fixed(day)).append(',').append(fixed(20 + 0.3 * day + 0.5 * t)).append('\n');
    }
    return csv.toString();
  }

  /**
   * 60 apple trees: rainfall and irrigation (standardised, correlated 0.95 by construction) and
   * age; yield 40 + 3 rain + 2 irrigation - 1.5 age plus normal noise of sd 2.
   */
  static String orchard() {
    RandomGenerator random = random(20240806L);
    StringBuilder csv = new StringBuilder("X[1],X[2],X[3],yield\n");
    for (int i = 0; i < 60; i++) {
      double rain = random.nextGaussian();
      double irrigation = 0.95 * rain + Math.sqrt(1 - 0.95 * 0.95) * random.nextGaussian();
      double age = random.nextGaussian();
      double yield = 40 + 3 * rain + 2 * irrigation - 1.5 * age + 2 * random.nextGaussian();
      csv.append(fixed(rain)).append(',').append(fixed(irrigation)).append(',')
          .append(fixed(age)).append(',').append(fixed(yield)).append('\n');
    }
    return csv.toString();
  }
}
