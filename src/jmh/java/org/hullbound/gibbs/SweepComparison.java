package org.hullbound.gibbs;

import java.io.IOException;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;

/**
 * The rows {@link GibbsSweepBenchmark} appended to {@code target/sweep-comparison.csv}, printed
 * side by side per model: each sampler's effective draws per CPU-second of the weakest unknown
 * (and of the named one), and hullbound's ratios to the No-U-Turn anchor (on the model's target
 * and, where run, on the hand-fused one), to random-walk Metropolis within Gibbs and to itself
 * without moves, the figures issue 12's goals are judged by. Runs of one pair repeated (both
 * parameter orders) are shown together, in file order.
 *
 * <p>{@code java -cp target/benchmarks.jar org.hullbound.gibbs.SweepComparison [FILE]}.
 */
public final class SweepComparison {
  private static final List<String> SAMPLERS = List.of(
      "hullbound", "hullbound-no-moves", "slice", "random-walk-metropolis", "no-u-turn",
      "no-u-turn-fused");

  private SweepComparison() {}

  public static void main(String[] args) throws IOException {
    Path file = Path.of(args.length > 0 ? args[0] : "target/sweep-comparison.csv");
    Map<String, Map<String, List<double[]>>> byModel = new LinkedHashMap<>();
    try (Reader reader = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
      for (CSVRecord row : CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true)
          .get().parse(reader)) {
        byModel.computeIfAbsent(row.get("model"), m -> new LinkedHashMap<>())
            .computeIfAbsent(row.get("sampler"), s -> new ArrayList<>())
            .add(new double[] {Double.parseDouble(row.get("ess_per_cpu_second_weakest")),
                Double.parseDouble(row.get("ess_per_cpu_second_named"))});
      }
    }
    for (Map.Entry<String, Map<String, List<double[]>>> model : byModel.entrySet()) {
      System.out.println(model.getKey()
          + ": effective draws per CPU-second, weakest unknown (named unknown)");
      Map<String, List<double[]>> runs = model.getValue();
      for (String sampler : SAMPLERS) {
        if (runs.containsKey(sampler)) {
          StringBuilder line = new StringBuilder(String.format(Locale.ROOT, "  %-24s", sampler));
          for (double[] run : runs.get(sampler)) {
            line.append(String.format(Locale.ROOT, " %10.1f (%.1f)", run[0], run[1]));
          }
          System.out.println(line);
        }
      }
      for (String baseline : List.of("no-u-turn", "no-u-turn-fused", "random-walk-metropolis",
          "hullbound-no-moves")) {
        if (runs.containsKey("hullbound") && runs.containsKey(baseline)) {
          StringBuilder line = new StringBuilder(
              String.format(Locale.ROOT, "  hullbound / %-22s", baseline));
          List<double[]> ours = runs.get("hullbound");
          List<double[]> theirs = runs.get(baseline);
          for (int k = 0; k < Math.min(ours.size(), theirs.size()); k++) {
            line.append(String.format(Locale.ROOT, " %6.2fx (%.2fx)",
                ours.get(k)[0] / theirs.get(k)[0], ours.get(k)[1] / theirs.get(k)[1]));
          }
          System.out.println(line);
        }
      }
    }
  }
}
