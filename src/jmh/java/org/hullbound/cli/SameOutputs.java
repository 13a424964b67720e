package org.hullbound.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import picocli.CommandLine;

/**
 * Writes what {@code check} prints for every model of {@code models/}, {@code validation/} and
 * the two catalogues of bad models (each with its companion data files), and the draws of a short
 * seeded {@code fit} of the demos {@code seedlings}, {@code clinics}, {@code extract}, {@code
 * wells}, the mixture {@code mussels} and the change point {@code fleet_faults}, one file each
 * under {@code OUT}: run it before and after a change of the compiler and compare the folders
 * with {@code diff -r}. A restructuring of the binder or of the
 * analyses must leave both the same, to the byte (issue 14: same reports, bit-identical draws).
 *
 * <p>In one JVM, so the 170-odd checks take seconds, not a JVM start each. From the project's
 * root: {@code java -cp target/benchmarks.jar org.hullbound.cli.SameOutputs OUT}.
 */
public final class SameOutputs {
  private static final List<String> FITTED =
      List.of("seedlings", "clinics", "extract", "wells", "mussels", "fleet_faults");

  private SameOutputs() {}

  public static void main(String[] args) throws IOException {
    Path out = Path.of(args[0]);
    Files.createDirectories(out);
    int written = 0;
    for (Path model : list(Path.of("models"), ".hbm")) {
      String name = stem(model);
      List<String> data = new ArrayList<>();
      if (name.equals("fill_weights")) {
        data = List.of("models/bottles.csv", "models/shifts.csv");
      } else if (Files.exists(Path.of("models", name + ".csv"))) {
        data = List.of("models/" + name + ".csv");
      }
      check(out.resolve("models_" + name + ".out"), model, data);
      written++;
    }
    try (Stream<Path> cases = Files.list(Path.of("validation"))) {
      for (Path folder : cases.filter(Files::isDirectory).sorted().toList()) {
        List<String> data = new ArrayList<>();
        for (Path csv : list(folder, ".csv")) {
          if (!csv.getFileName().toString().equals("reference.csv")) {
            data.add(csv.toString());
          }
        }
        check(out.resolve("validation_" + folder.getFileName() + ".out"),
            folder.resolve("model.hbm"), data);
        written++;
      }
    }
    for (String catalogue : List.of("model", "lang")) {
      Path folder = Path.of("src/test/resources/org/hullbound", catalogue, "bad");
      for (Path model : list(folder, ".hbm")) {
        String name = stem(model);
        List<String> data = new ArrayList<>();
        for (String suffix : List.of(".csv", ".2.csv")) {
          if (Files.exists(folder.resolve(name + suffix))) {
            data.add(folder.resolve(name + suffix).toString());
          }
        }
        check(out.resolve("bad_" + catalogue + "_" + name + ".out"), model, data);
        written++;
      }
    }
    for (String demo : FITTED) {
      Path folder = Files.createTempDirectory("same-outputs-" + demo);
      Path fitted = folder.resolve("fit");
      List<String> fit = new ArrayList<>(List.of("fit", "models/" + demo + ".hbm"));
      if (Files.exists(Path.of("models", demo + ".csv"))) {
        fit.addAll(List.of("--data", "models/" + demo + ".csv"));
      }
      fit.addAll(List.of("--seed", "20261202", "--draws", "300", "--burn-in", "200", "--quiet",
          "--out", fitted.toString()));
      String text = run(fit);
      // The printed text has times in it; only the exit code and the draws must be the same.
      Files.writeString(out.resolve("fit_" + demo + ".out"),
          text.substring(text.lastIndexOf("exit ")));
      // Chains write their rows as they go, interleaved by timing: compare the rows sorted.
      List<String> rows = new ArrayList<>(Files.readAllLines(fitted.resolve("draws.csv")));
      List<String> sorted = new ArrayList<>(rows.subList(0, 1));
      sorted.addAll(rows.subList(1, rows.size()).stream().sorted().toList());
      Files.write(out.resolve("fit_" + demo + "_draws.csv"), sorted);
      written++;
    }
    System.out.println(written + " outputs written to " + out);
  }

  private static void check(Path file, Path model, List<String> data) throws IOException {
    List<String> args = new ArrayList<>(List.of("check", model.toString()));
    for (String d : data) {
      args.add("--data");
      args.add(d);
    }
    Files.writeString(file, run(args));
  }

  /** What the command prints on both streams, then its exit code. */
  private static String run(List<String> args) {
    StringWriter text = new StringWriter();
    PrintWriter writer = new PrintWriter(text);
    CommandLine line = Main.commandLine();
    line.setOut(writer);
    line.setErr(writer);
    int code = line.execute(args.toArray(String[]::new));
    writer.flush();
    return text + "exit " + code + "\n";
  }

  private static List<Path> list(Path folder, String suffix) throws IOException {
    try (Stream<Path> files = Files.list(folder)) {
      return files.filter(p -> p.getFileName().toString().endsWith(suffix)).sorted().toList();
    }
  }

  private static String stem(Path file) {
    String name = file.getFileName().toString();
    return name.substring(0, name.lastIndexOf('.'));
  }
}
