package org.hullbound.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.lang.ref.WeakReference;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.CyclicBarrier;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.junit.jupiter.api.Test;

/**
 * Several fits at once in one JVM ({@code fit-units} and calibration on local workers or Spark
 * executors, a library user's threads) share {@link RowColumn#shared}'s process-wide table of long
 * columns. Compiling models in several threads at once, some on the same data and some on
 * different data of the same length, gives every conditional and every move's line the
 * evaluations, bit for bit, of the same models compiled one after the other: no fit reads a column
 * of another's data, and no column is changed by another fit after it was shared. The table holds
 * its columns weakly: a column no fit uses any more is collected.
 *
 * <p>The reference is the sequential compile itself (the claim is identity; no outside source is
 * needed). The clinics model has 1,200 rows and the generated data 3,000, above {@link
 * RowColumn#SHARED_FROM}, so that the outcome and the doses are looked up in the table.
 *
 * <p>Seen to fail: with the table matching columns by length alone, all three tests fail (the
 * grouped conditionals of the generated data no longer equal one evaluator a term); with the
 * table's lock removed, the test of the table under threads failed in 2 of 3 runs (a race, so not
 * every run: a {@code ConcurrentModificationException} of a column list).
 */
class ConcurrentCompileTest {
  private static final int THREADS = 6;
  private static final int ROUNDS = 2;

  private static final String CLINICS = readClinics();

  private static String readClinics() {
    try {
      return Files.readString(Path.of("models", "clinics.hbm"));
    } catch (java.io.IOException e) {
      throw new java.io.UncheckedIOException(e);
    }
  }

  /**
   * Clinics data: the demo's file (seed 0), or {@code rows} rows generated from {@code seed} with
   * doses that differ from row to row, so that no rows are summed as one group and every row's
   * numbers are read from the columns.
   */
  private static DataTable data(long seed, int rows) throws Exception {
    if (seed == 0) {
      return org.hullbound.io.CsvData.read(Path.of("models", "clinics.csv"));
    }
    SplittableRandom random = new SplittableRandom(seed);
    List<List<String>> cells = new ArrayList<>();
    for (int r = 0; r < rows; r++) {
      cells.add(List.of(Integer.toString(1 + random.nextInt(36)),
          Double.toString(3 * random.nextDouble()), Integer.toString(random.nextInt(2))));
    }
    return DataTable.of("clinics-" + seed + ".csv", List.of("clinic_of", "dose", "recovered"),
        cells);
  }

  /**
   * Binds and compiles the model on {@code seed}'s data and evaluates every conditional and every
   * move's line at fixed points: their values and slopes as raw bits, in a fixed order. With
   * {@code grouped} false the conditionals are compiled one evaluator a term, which reads no
   * shared column, and the lines are left out.
   */
  private static long[] evaluations(long seed, boolean grouped) throws Exception {
    BoundModel model = BoundModel.bind(
        Parser.parse(SourceText.of("clinics.hbm", CLINICS)), List.of(data(seed, 3000)));
    double[] start = model.initialState();
    double[][] states = {start, start.clone()};
    for (int j = 0; j < start.length; j++) {
      states[1][j] += 0.05 * (1 + j % 3);
    }
    List<Long> bits = new ArrayList<>();
    double[] slope = new double[1];
    for (double[] state : states) {
      for (int i = 0; i < start.length; i++) {
        ConditionalDensity conditional = grouped ? model.conditional(i) : model.compiled(i, false);
        double u0 = conditional.toSamplingScale(state[i]);
        for (double du : new double[] {-0.5, 0.0, 0.3}) {
          bits.add(Double.doubleToRawLongBits(conditional.logDensity(u0 + du, state, slope)));
          bits.add(Double.doubleToRawLongBits(slope[0]));
        }
      }
    }
    // the lines after every conditional, so that the conditionals alone are a prefix
    for (double[] state : states) {
      for (Update move : grouped ? model.moves() : List.<Update>of()) {
        LineDensity line = move instanceof Update.GroupMove group ? group.line()
            : ((Update.DirectionBlock) move).line();
        double[] frame = new double[line.frameLength()];
        line.load(state, frame);
        if (line.learned()) {
          double[] direction = new double[line.members().length];
          java.util.Arrays.fill(direction, 1 / Math.sqrt(direction.length));
          line.direct(direction, frame);
        }
        for (double dt : new double[] {-0.1, 0.0, 0.2}) {
          bits.add(Double.doubleToRawLongBits(line.logDensity(line.identity() + dt, frame, slope)));
          bits.add(Double.doubleToRawLongBits(slope[0]));
        }
      }
    }
    return bits.stream().mapToLong(Long::longValue).toArray();
  }

  @Test
  void modelsCompiledInSeveralThreadsAtOnceEvaluateAsWhenCompiledOneAfterAnother()
      throws Exception {
    // the demo file, and two generated files of the same length: same data in two threads each
    long[] seeds = {0, 1, 2, 0, 1, 2};
    List<long[]> concurrent = new ArrayList<>();
    ExecutorService pool = Executors.newFixedThreadPool(THREADS);
    try {
      for (int round = 0; round < ROUNDS; round++) {
        CyclicBarrier together = new CyclicBarrier(THREADS);
        List<Future<long[]>> results = new ArrayList<>();
        for (long seed : seeds) {
          results.add(pool.submit(() -> {
            together.await(60, TimeUnit.SECONDS);
            return evaluations(seed, true);
          }));
        }
        for (Future<long[]> result : results) {
          concurrent.add(result.get(5, TimeUnit.MINUTES));
        }
      }
    } finally {
      pool.shutdownNow();
    }
    Map<Long, long[]> sequential = new java.util.HashMap<>();
    for (long seed : new long[] {0, 1, 2}) {
      sequential.put(seed, evaluations(seed, true));
    }
    assertTrue(sequential.get(0L).length > 200, "every conditional and line evaluated");
    // the sequential compile against one evaluator a term, where no rows are summed as a group:
    // a column taken from the table that is not the data's own fails here whatever the order
    for (long seed : new long[] {1, 2}) {
      long[] alone = evaluations(seed, false);
      assertArrayEquals(alone, java.util.Arrays.copyOf(sequential.get(seed), alone.length),
          "data " + seed + ": grouped conditionals against one evaluator a term");
    }
    for (int k = 0; k < concurrent.size(); k++) {
      long seed = seeds[k % seeds.length];
      assertArrayEquals(sequential.get(seed), concurrent.get(k),
          "round " + k / seeds.length + ", thread " + k % seeds.length + ", data " + seed);
    }
  }

  /**
   * The table itself under threads: every caller gets a column equal bit for bit to its own
   * numbers, and every caller of the same numbers the one array while it is in use.
   */
  @Test
  void columnsSharedFromSeveralThreadsAreEachTheirOwnNumbersAndOneArrayPerNumbers()
      throws Exception {
    int rows = RowColumn.SHARED_FROM + 500;
    Map<Integer, double[]> firstSeen = new ConcurrentHashMap<>();
    ExecutorService pool = Executors.newFixedThreadPool(THREADS);
    try {
      CyclicBarrier together = new CyclicBarrier(THREADS);
      List<Future<Integer>> results = new ArrayList<>();
      for (int t = 0; t < THREADS; t++) {
        results.add(pool.submit(() -> {
          together.await(60, TimeUnit.SECONDS);
          int checked = 0;
          for (int k = 0; k < 1000; k++) {
            // every thread asks for the same new numbers at about the same time, then again
            int kind = k % 500;
            double[] numbers = new double[rows];
            for (int r = 0; r < rows; r++) {
              numbers[r] = kind + r * 0.25;
            }
            double[] held = RowColumn.shared(numbers, rows);
            assertTrue(java.util.Arrays.equals(numbers, held), "kind " + kind);
            double[] first = firstSeen.putIfAbsent(kind, held);
            assertSame(first == null ? held : first, held, "one array for kind " + kind);
            checked++;
          }
          return checked;
        }));
      }
      for (Future<Integer> result : results) {
        assertEquals(1000, result.get(5, TimeUnit.MINUTES));
      }
    } finally {
      pool.shutdownNow();
    }
  }

  /**
   * A column only one fit used is not kept alive by the table once that fit lets it go, while
   * another fit's columns stay shared: the table holds columns weakly.
   */
  @Test
  void aColumnNoFitUsesAnyMoreIsCollected() throws Exception {
    int rows = RowColumn.SHARED_FROM + 17;
    double[] kept = numbers(rows, 0.125);
    double[] keptShared = RowColumn.shared(kept, rows);
    WeakReference<double[]> dropped =
        new WeakReference<>(RowColumn.shared(numbers(rows, 0.375), rows));
    for (int tries = 0; tries < 50 && dropped.get() != null; tries++) {
      System.gc();
      Thread.sleep(20);
    }
    assertTrue(dropped.get() == null, "the dropped column was collected");
    assertSame(keptShared, RowColumn.shared(kept, rows), "the column in use is still shared");
  }

  private static double[] numbers(int rows, double step) {
    double[] numbers = new double[rows];
    for (int r = 0; r < rows; r++) {
      numbers[r] = 1e6 + r * step;
    }
    return numbers;
  }
}
