package org.hullbound.io;

import java.io.BufferedReader;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.concurrent.TimeUnit;
import java.util.function.Predicate;
import org.hullbound.lang.Parser;
import org.hullbound.lang.SourceText;
import org.hullbound.model.BoundModel;
import org.hullbound.model.DataTable;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.TearDown;

/**
 * Reading a large data file ({@link LargeClinicsFile}, the clinics model's data scaled up) into a
 * {@link DataTable} as {@code check} does, against a baseline in the same run: a plain loop that
 * reads lines, splits them at commas and parses every cell into growing double arrays, with no
 * quoting, positions or checks. The ratio is the price of RFC 4180, line tracking and the missing
 * and non-number bookkeeping.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
public class DataLoadingBenchmark {
  @Param({"1000000"})
  public long rows;

  private Path file;
  private Predicate<String> readsColumn;

  @Setup(Level.Trial)
  public void setUp() throws IOException {
    file = Files.createTempFile("clinics-large", ".csv");
    LargeClinicsFile.write(file, rows);
    Path model = Path.of(System.getProperty("hullbound.models", "models"), "clinics.hbm");
    readsColumn =
        BoundModel.readsColumn(
            Parser.parse(SourceText.of(model.toString(), Files.readString(model))));
  }

  @TearDown(Level.Trial)
  public void tearDown() throws IOException {
    Files.deleteIfExists(file);
  }

  @Benchmark
  public DataTable csvData() {
    return CsvData.read(file, readsColumn);
  }

  @Benchmark
  public double[][] lineSplitBaseline() throws IOException {
    try (BufferedReader in = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
      int columns = in.readLine().split(",").length;
      double[][] values = new double[columns][1024];
      int size = 0;
      for (String line = in.readLine(); line != null; line = in.readLine()) {
        if (size == values[0].length) {
          for (int j = 0; j < columns; j++) {
            values[j] = Arrays.copyOf(values[j], 2 * size);
          }
        }
        String[] cells = line.split(",");
        for (int j = 0; j < columns; j++) {
          values[j][size] = Double.parseDouble(cells[j]);
        }
        size++;
      }
      return values;
    }
  }
}
