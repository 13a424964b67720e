package org.hullbound.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.stream.Stream;
import net.jqwik.api.Arbitraries;
import net.jqwik.api.Arbitrary;
import net.jqwik.api.Assume;
import net.jqwik.api.Combinators;
import net.jqwik.api.EdgeCasesMode;
import net.jqwik.api.statistics.Statistics;
import net.jqwik.api.ForAll;
import net.jqwik.api.Property;
import net.jqwik.api.Provide;
import net.jqwik.api.lifecycle.AfterContainer;
import org.hullbound.gibbs.MemoryBudget;

/**
 * Bad input never loses data and never shows a stack trace: random data files for {@code fit} and
 * {@code check} (ragged rows, unicode, 1e308 and 1e999, empty files, random bytes, NA in
 * covariates, missing columns) and random command lines for {@code fit} (random options and
 * values, negative, zero and huge counts, missing files, folders given as files) must each end
 * with exit status 0, 1 or 2, a message on standard error for a non-zero status, no Java stack
 * trace and no internal error, and an earlier run's files untouched unless {@code --overwrite}.
 *
 * <p>Runs are kept tiny (one or two chains, a handful of sweeps) so the whole fuzz stays well under
 * twenty seconds; command lines whose run would be long and valid are skipped, not sampled.
 */
class FitFuzzProperties {
  private static final Path ROOT = createRoot();
  private static final AtomicInteger RUNS = new AtomicInteger();

  /** A regression of y on a covariate x (3 unknowns); invented for these tests. */
  private static final String LINE_MODEL =
      "model fuzz_line\nindex row\ndata x[row]\ndata y[row] ~ normal(mean = a + b * x[row], sd = s)\n"
          + "param a ~ normal(mean = 0, sd = 10)\nparam b ~ normal(mean = 0, sd = 10)\n"
          + "param s ~ half-normal(sd = 5)\n";

  private static final Path LINE = write("line.hbm", LINE_MODEL);
  private static final Path LINE_DATA =
      write("line.csv", "x,y\n0,1.1\n1,2.9\n2,5.2\n3,6.8\n4,9.1\n5,11.2\n");
  private static final Path SEEDLINGS = Path.of("models/seedlings.hbm");
  private static final Path EARLIER = earlierRun();
  private static final Map<String, byte[]> EARLIER_FILES = snapshot(EARLIER);

  // ---------------------------------------------------------------- data files

  @Property(tries = 120, edgeCases = EdgeCasesMode.MIXIN, seed = "20261202")
  void anyDataFileForTheLineModelEndsCleanly(@ForAll("lineData") byte[] content) {
    Path data = writeBytes("data-" + RUNS.incrementAndGet() + ".csv", content);
    assertCleanEnd(CliRun.of("check", LINE.toString(), "--data", data.toString()));
    CliRun fit = tinyFit(LINE, data);
    assertCleanEnd(fit);
    Statistics.label("fit exit").collect(fit.exit());
  }

  @Property(tries = 80, edgeCases = EdgeCasesMode.MIXIN, seed = "20261203")
  void anyDataFileForTheSeedlingsModelEndsCleanly(@ForAll("seedlingData") byte[] content) {
    Path data = writeBytes("data-" + RUNS.incrementAndGet() + ".csv", content);
    assertCleanEnd(CliRun.of("check", SEEDLINGS.toString(), "--data", data.toString()));
    CliRun fit = tinyFit(SEEDLINGS, data);
    assertCleanEnd(fit);
    Statistics.label("fit exit").collect(fit.exit());
  }

  private static CliRun tinyFit(Path model, Path data) {
    return CliRun.of("fit", model.toString(), "--data", data.toString(), "--chains", "2",
        "--draws", "4", "--burn-in", "3", "--seed", "1", "--quiet", "--out",
        ROOT.resolve("out-" + RUNS.incrementAndGet()).toString());
  }

  @Provide
  Arbitrary<byte[]> lineData() {
    return dataFile(List.of("x", "y"), Arbitraries.doubles().between(-10, 10).map(String::valueOf));
  }

  @Provide
  Arbitrary<byte[]> seedlingData() {
    // Mostly valid rows (bench 1..8, survivors at most planted), then odd counts by chance.
    Arbitrary<String> valid = Combinators.combine(
            Arbitraries.integers().between(1, 30), Arbitraries.integers().between(1, 8),
            Arbitraries.doubles().between(0, 1))
        .as((n, bench, share) -> n + "," + bench + "," + (int) Math.floor(share * n));
    Arbitrary<String> counts =
        Arbitraries.of("-1", "0", "1", "8", "9", "31", "2147483648", "1.5", "NA", "1e308");
    return dataFile(List.of("planted", "bench_of", "survived"), counts, valid);
  }

  private static Arbitrary<String> numericCells() {
    return Arbitraries.oneOf(
        Arbitraries.doubles().between(-100, 100).map(String::valueOf),
        Arbitraries.integers().between(-5, 5).map(String::valueOf),
        Arbitraries.of("NA", "", "1e308", "-1e308", "1e999", "-1e999", "NaN", "inf", "-Inf",
            "4.9e-324", "1e-400", "-0", "+5", " 3 ", "3 4", "0x1A", "１２", "é", "\u0000", "💥",
            "\"1,5\"", "\"\"", "\"open", "\"a\"\"b\"", "1;2", "\t"),
        Arbitraries.strings().ofMaxLength(6));
  }

  private static Arbitrary<byte[]> dataFile(List<String> columns, Arbitrary<String> usual) {
    List<String> width = columns;
    return dataFile(columns, usual,
        usual.list().ofSize(width.size()).map(cells -> String.join(",", cells)));
  }

  /**
   * Files whose rows are mostly {@code validRow}, with odd cells, odd widths and odd headers mixed
   * in.
   */
  private static Arbitrary<byte[]> dataFile(
      List<String> columns, Arbitrary<String> usual, Arbitrary<String> validRow) {
    Arbitrary<String> cells = Arbitraries.frequencyOf(
        net.jqwik.api.Tuple.of(12, usual), net.jqwik.api.Tuple.of(1, numericCells()));
    List<String> extra = new ArrayList<>(columns);
    extra.add("z");
    List<String> dropped = columns.subList(1, columns.size());
    List<String> reversed = new ArrayList<>(columns);
    java.util.Collections.reverse(reversed);
    List<String> doubled = new ArrayList<>(columns);
    doubled.add(columns.get(0));
    Arbitrary<String> header =
        Arbitraries.frequencyOf(
            net.jqwik.api.Tuple.of(6, Arbitraries.just(String.join(",", columns))),
            net.jqwik.api.Tuple.of(2, Arbitraries.of(String.join(",", reversed),
                String.join(",", dropped), String.join(",", extra), String.join(",", doubled),
                "\uFEFF" + String.join(",", columns), String.join(";", columns), "",
                String.join(",", columns).toUpperCase(), "\"" + String.join("\",\"",
                    columns) + "\"",
                "é," + String.join(",", dropped))));
    Arbitrary<String> row = Arbitraries.frequencyOf(
        net.jqwik.api.Tuple.of(12, validRow),
        net.jqwik.api.Tuple.of(4,
            cells.list().ofSize(columns.size()).map(l -> String.join(",", l))),
        net.jqwik.api.Tuple.of(1, cells.list().ofMinSize(0).ofMaxSize(columns.size() + 1)
            .map(list -> String.join(",", list))));
    Arbitrary<String> text = Combinators.combine(
            header, row.list().ofMinSize(1).ofMaxSize(8), Arbitraries.of("\n", "\r\n", "\r"),
            Arbitraries.of(true, false))
        .as((h, rows, newline, trailing) -> {
          StringBuilder b = new StringBuilder(h);
          for (String r : rows) {
            b.append(newline).append(r);
          }
          return trailing ? b.append(newline).toString() : b.toString();
        });
    Arbitrary<byte[]> randomBytes = Arbitraries.bytes().array(byte[].class).ofMaxSize(120);
    return Arbitraries.frequencyOf(
        net.jqwik.api.Tuple.of(8, text.map(t -> t.getBytes(StandardCharsets.UTF_8))),
        net.jqwik.api.Tuple.of(1, randomBytes),
        net.jqwik.api.Tuple.of(1, Arbitraries.just(new byte[0])));
  }

  // ---------------------------------------------------------------- command lines

  @Property(tries = 250, edgeCases = EdgeCasesMode.MIXIN, seed = "20261204")
  void anyCommandLineEndsCleanlyAndLeavesAnEarlierRunAlone(
      @ForAll("commandLines") List<String> args) {
    Assume.that(!longValidRun(args));
    CliRun run = CliRun.of(args.toArray(String[]::new));
    assertCleanEnd(run);
    Statistics.label("exit").collect(run.exit());
    if (!args.contains("--overwrite")) {
      assertEquals(EARLIER_FILES.keySet(), snapshot(EARLIER).keySet(), "earlier run's files");
      snapshot(EARLIER).forEach((name, bytes) ->
          assertTrue(java.util.Arrays.equals(EARLIER_FILES.get(name), bytes), name + " unchanged"));
    } else {
      restoreEarlierRun();
    }
  }

  @Provide
  Arbitrary<List<String>> commandLines() {
    Arbitrary<String> model = Arbitraries.frequencyOf(
        net.jqwik.api.Tuple.of(6, Arbitraries.just(LINE.toString())),
        net.jqwik.api.Tuple.of(1, Arbitraries.of(
            ROOT.resolve("missing.hbm").toString(), ROOT.toString(),
            write("empty.hbm", "").toString(),
            writeBytes("bytes.hbm", new byte[] {(byte) 0xFF, 0, 'x', (byte) 0x80}).toString(),
            write("broken.hbm", "model m\nparam a ~ normal(mean = , sd = 1)\n").toString(),
            SEEDLINGS.toString())));
    Arbitrary<String> dataPath = Arbitraries.frequencyOf(
        net.jqwik.api.Tuple.of(5, Arbitraries.just(LINE_DATA.toString())),
        net.jqwik.api.Tuple.of(1, Arbitraries.of(
            ROOT.resolve("missing.csv").toString(), ROOT.toString(),
            write("empty.csv", "").toString(),
            writeBytes("bytes.csv", new byte[] {'x', ',', (byte) 0xC3}).toString(),
            write("ragged.csv", "x,y\n1\n2,3,4\n").toString())));
    Arbitrary<String> initPath = Arbitraries.of(
        write("init.csv", "a,0.5\nb,1\n").toString(), write("badname.csv", "q,1\n").toString(),
        write("badvalue.csv", "s,-2\n").toString(), write("nan.csv", "a,NaN\n").toString(),
        write("huge.csv", "a,1e999\n").toString(), ROOT.resolve("missing-init.csv").toString(),
        ROOT.toString(), write("empty-init.csv", "").toString());
    Arbitrary<String> outPath = Arbitraries.of("fresh", "fresh", "fresh", EARLIER.toString(),
        LINE_DATA.toString(), LINE_DATA.resolve("below").toString());
    Arbitrary<String> count = Arbitraries.of("-1", "0", "1", "2", "3", "2147483647", "2147483648",
        "99999999999", "abc", "", "1.5", "0x10", "-0", "1e3", "NaN", "３");
    Arbitrary<String> name = Arbitraries.strings().withCharRange('a', 'z').withChars('-', 'é')
        .ofMinLength(1).ofMaxLength(8);
    Arbitrary<List<String>> option = Arbitraries.frequencyOf(
        net.jqwik.api.Tuple.of(3, Combinators.combine(
            Arbitraries.of("--chains", "--draws", "--thin", "--burn-in", "--threads"), count)
            .as(List::of)),
        net.jqwik.api.Tuple.of(1, Arbitraries.of("0", "-1", "9223372036854775807",
            "9223372036854775808", "x").map(v -> List.of("--seed", v))),
        net.jqwik.api.Tuple.of(2, dataPath.map(p -> List.of("--data", p))),
        net.jqwik.api.Tuple.of(1, initPath.map(p -> List.of("--init", p))),
        net.jqwik.api.Tuple.of(2, outPath.map(p -> List.of("--out", p))),
        net.jqwik.api.Tuple.of(1, Arbitraries.of("--overwrite", "--quiet", "-h", "-V", "--", "-",
            "--data", "--out").map(List::of)),
        net.jqwik.api.Tuple.of(1, Combinators.combine(name, Arbitraries.strings().ofMaxLength(5))
            .as((n, v) -> List.of("--" + n, v))),
        net.jqwik.api.Tuple.of(1, Arbitraries.strings().ofMaxLength(6).map(List::of)));
    return Combinators.combine(
            Arbitraries.of("fit", "fit", "fit", "check"), model, option.list().ofMaxSize(6),
            Arbitraries.of(true, false))
        .as((command, m, options, equalsForm) -> {
          List<String> args = new ArrayList<>(List.of(command, m));
          for (List<String> o : options) {
            if (equalsForm && o.size() == 2 && o.get(0).startsWith("--")) {
              args.add(o.get(0) + "=" + o.get(1));
            } else {
              args.addAll(o);
            }
          }
          for (int k = 0; k < args.size(); k++) {
            if (args.get(k).equals("fresh") || args.get(k).equals("--out=fresh")) {
              String fresh = ROOT.resolve("cli-" + RUNS.incrementAndGet()).toString();
              args.set(k, args.get(k).startsWith("--out=") ? "--out=" + fresh : fresh);
            }
          }
          if (command.equals("fit")) {
            // Small runs unless the line chose otherwise; a repeated option is itself a case.
            addUnless(args, "--chains", "1");
            addUnless(args, "--draws", "3");
            addUnless(args, "--burn-in", "2");
            addUnless(args, "--out", ROOT.resolve("cli-" + RUNS.incrementAndGet()).toString());
            if (!args.contains("--data") && !args.stream().anyMatch(a -> a.startsWith("--data="))) {
              args.addAll(List.of("--data", LINE_DATA.toString()));
            }
            if (!args.contains("--quiet")) {
              args.add("--quiet");
            }
          }
          return args;
        });
  }

  private static void addUnless(List<String> args, String option, String value) {
    boolean given = args.stream().anyMatch(a -> a.equals(option) || a.startsWith(option + "="));
    if (!given) {
      args.addAll(List.of(option, value));
    }
  }

  /**
   * True when the line would run a valid fit of more than 20 000 sweeps in all: not a fuzz case.
   */
  private static boolean longValidRun(List<String> args) {
    if (!args.get(0).equals("fit")) {
      return false;
    }
    Map<String, Long> values = new LinkedHashMap<>(
        Map.of("--chains", 4L, "--draws", 1000L, "--burn-in", 1000L, "--thin", 1L));
    for (int k = 1; k < args.size(); k++) {
      String a = args.get(k);
      for (String option : values.keySet()) {
        String value = null;
        if (a.equals(option) && k + 1 < args.size()) {
          value = args.get(k + 1);
        } else if (a.startsWith(option + "=")) {
          value = a.substring(option.length() + 1);
        }
        if (value != null) {
          try {
            values.put(option, Long.parseLong(value));
          } catch (NumberFormatException notANumber) {
            return false;
          }
        }
      }
    }
    long chains = values.get("--chains");
    long draws = values.get("--draws");
    long burnIn = values.get("--burn-in");
    long thin = values.get("--thin");
    if (chains < 1 || draws < 1 || burnIn < 0 || thin < 1 || chains > Integer.MAX_VALUE
        || draws > Integer.MAX_VALUE || thin > Integer.MAX_VALUE || burnIn > Integer.MAX_VALUE) {
      return false;
    }
    double sweeps = burnIn + (double) draws * thin;
    if (sweeps > Integer.MAX_VALUE) {
      return false;
    }
    MemoryBudget budget = MemoryBudget.of(chains, draws, 10);
    boolean fits = budget.against(Runtime.getRuntime().maxMemory()) != MemoryBudget.Decision.REFUSE;
    return fits && chains * sweeps > 20_000;
  }

  // ---------------------------------------------------------------- checks and files

  static void assertCleanEnd(CliRun run) {
    assertTrue(run.exit() == 0 || run.exit() == 1 || run.exit() == 2, run.toString());
    if (run.exit() != 0) {
      assertFalse(run.err().isBlank(), "a message for exit " + run.exit() + "\n" + run);
    }
    assertFalse(run.err().contains("\tat "), run.toString());
    assertFalse(run.err().contains("Exception in thread"), run.toString());
    assertFalse(run.err().contains("internal error"), run.toString());
  }

  private static Path earlierRun() {
    Path out = ROOT.resolve("earlier");
    CliRun run = CliRun.of("fit", LINE.toString(), "--data", LINE_DATA.toString(), "--chains", "1",
        "--draws", "5", "--burn-in", "5", "--seed", "4", "--quiet", "--out", out.toString());
    if (run.exit() != 0) {
      throw new IllegalStateException("the earlier run failed: " + run);
    }
    return out;
  }

  private static void restoreEarlierRun() {
    try (Stream<Path> files = Files.list(EARLIER)) {
      for (Path file : files.toList()) {
        Files.delete(file);
      }
      for (Map.Entry<String, byte[]> file : EARLIER_FILES.entrySet()) {
        Files.write(EARLIER.resolve(file.getKey()), file.getValue());
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }

  private static Map<String, byte[]> snapshot(Path folder) {
    Map<String, byte[]> files = new java.util.TreeMap<>();
    try (Stream<Path> entries = Files.list(folder)) {
      for (Path file : entries.toList()) {
        files.put(file.getFileName().toString(), Files.readAllBytes(file));
      }
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
    return files;
  }

  private static Path createRoot() {
    try {
      return Files.createTempDirectory("hullbound-fuzz");
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }

  private static Path write(String name, String text) {
    return writeBytes(name, text.getBytes(StandardCharsets.UTF_8));
  }

  private static Path writeBytes(String name, byte[] bytes) {
    try {
      return Files.write(ROOT.resolve(name), bytes);
    } catch (IOException e) {
      throw new UncheckedIOException(e);
    }
  }

  @AfterContainer
  static void removeFiles() throws IOException {
    try (Stream<Path> all = Files.walk(ROOT)) {
      for (Path p : all.sorted(Comparator.reverseOrder()).toList()) {
        Files.deleteIfExists(p);
      }
    }
  }
}
